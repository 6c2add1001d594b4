// Builds the compiled command line (dist/portolan.mjs) once before the tests, so that tests which run
// `portolan` as a person would run today's sources, never a stale build.
// @ts-expect-error -- a plain JavaScript build script without type declarations
import { buildCli } from "../scripts/build-cli.mjs";

export default async function setup(): Promise<void> {
  await (buildCli as () => Promise<string>)();
}
