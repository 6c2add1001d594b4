// Builds the `portolan` command line (engine/cli.ts and everything it imports) into one JavaScript file,
// dist/portolan.mjs, so that a call starts without compiling TypeScript. Run by `npm install` (prepare),
// `npm run build`, `npm run build:cli` and the vitest global setup.
import { chmodSync, existsSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { build } from "esbuild";

const root = join(dirname(fileURLToPath(import.meta.url)), "..");
export const CLI_OUTFILE = join(root, "dist", "portolan.mjs");
export const WORKER_OUTFILE = join(root, "dist", "job-worker.mjs");
export const QUEUE_WORKER_OUTFILE = join(root, "dist", "queue-worker.mjs");

const requireBanner = 'import { createRequire as __portolanRequire } from "node:module";\nconst require = __portolanRequire(import.meta.url);';

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
    banner: { js: `#!/usr/bin/env node\n${requireBanner}` },
  });
  chmodSync(CLI_OUTFILE, 0o755);
  await buildJobWorkers();
  return CLI_OUTFILE;
}

/**
 * Bundles the job thread (lib/server/jobs/worker-entry.ts → dist/job-worker.mjs, loaded by piscina) and the
 * queue worker process (lib/server/jobs/queue-worker.ts → dist/queue-worker.mjs, `npm run worker`), so
 * that neither needs TypeScript at run time. Packages stay external: they are in node_modules.
 */
export async function buildJobWorkers() {
  const common = {
    bundle: true,
    platform: "node",
    format: "esm",
    target: "node20",
    sourcemap: "linked",
    logLevel: "warning",
    banner: { js: requireBanner },
  };
  await build({ ...common, entryPoints: [join(root, "lib", "server", "jobs", "worker-entry.ts")], outfile: WORKER_OUTFILE });
  const queueEntry = join(root, "lib", "server", "jobs", "queue-worker.ts");
  if (existsSync(queueEntry)) await build({ ...common, entryPoints: [queueEntry], outfile: QUEUE_WORKER_OUTFILE, external: ["@libsql/client", "@node-rs/argon2", "bullmq", "ioredis", "piscina", "nodemailer", "smtp-server"], alias: { "server-only": join(root, "scripts", "server-only-shim.mjs") } });
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  await buildCli();
}
