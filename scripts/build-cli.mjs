// Builds the `portolan` command line (engine/cli.ts and everything it imports) into one JavaScript file,
// dist/portolan.mjs, so that a call starts without compiling TypeScript. Run by `npm install` (prepare),
// `npm run build`, `npm run build:cli` and the vitest global setup.
import { chmodSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { build } from "esbuild";

const root = join(dirname(fileURLToPath(import.meta.url)), "..");
export const CLI_OUTFILE = join(root, "dist", "portolan.mjs");

/**
 * Bundles the CLI with esbuild (ESM, Node 20). Bundled CommonJS dependencies get a `require` made by
 * createRequire, since an ES module has none.
 *
 * @returns the path of the built file
 */
export async function buildCli() {
  await build({
    entryPoints: [join(root, "engine", "cli.ts")],
    outfile: CLI_OUTFILE,
    bundle: true,
    platform: "node",
    format: "esm",
    target: "node20",
    sourcemap: "linked",
    logLevel: "warning",
    banner: { js: '#!/usr/bin/env node\nimport { createRequire as __portolanRequire } from "node:module";\nconst require = __portolanRequire(import.meta.url);' },
  });
  chmodSync(CLI_OUTFILE, 0o755);
  return CLI_OUTFILE;
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  await buildCli();
}
