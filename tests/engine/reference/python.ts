/**
 * The one way the tests run their references: Debian's /usr/bin/python3 with numpy (and scikit-rf 0.15.4
 * when asked), with the numpy alias shim that scikit-rf 0.15 needs before it imports (numpy 1.24 removed
 * np.complex, np.float and np.int). A missing interpreter or library is an error that says what to
 * install: the reference tests do not skip.
 */
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";

export const PYTHON = "/usr/bin/python3";

const INSTALL_HINT =
  "the reference tests need Debian's /usr/bin/python3 with numpy and scikit-rf 0.15.4: " +
  "install them with `apt-get install -y python3 python3-numpy python3-scikit-rf` (the README's test command does this)";

/** numpy 1.24 dropped these aliases; scikit-rf 0.15.4 still uses them. */
const NUMPY_SHIM = "import numpy as np\nnp.complex = complex; np.float = float; np.int = int\n";

/** skrf prints notices (matplotlib) on import: keep them off stdout, which carries the answer. */
const SKRF_IMPORT = "import contextlib as _ctx, sys as _sys\nwith _ctx.redirect_stdout(_sys.stderr):\n    import skrf\n";

export type PythonOptions = {
  /** written to the script's stdin (JSON-serialised unless a string) */
  input?: unknown;
  /** sys.argv[1:] of the script */
  args?: string[];
  /** import numpy (with the shim) first; default true */
  numpy?: boolean;
  /** import scikit-rf (after the shim) first; default false */
  skrf?: boolean;
  /** extra environment variables */
  env?: NodeJS.ProcessEnv;
};

let probed: string | null | undefined;

/**
 * The version of scikit-rf that /usr/bin/python3 imports (with numpy and the shim), or null when it cannot.
 * Probed once per test process.
 *
 * @example referenceSkrfVersion() // "0.15.4"
 */
export function referenceSkrfVersion(): string | null {
  if (probed !== undefined) return probed;
  if (!existsSync(PYTHON)) return (probed = null);
  const probe = spawnSync(PYTHON, ["-c", `${NUMPY_SHIM}${SKRF_IMPORT}print(skrf.__version__)`], { encoding: "utf8", timeout: 60_000 });
  probed = probe.status === 0 ? probe.stdout.trim().split("\n").pop() ?? "" : null;
  return probed;
}

/**
 * Throws, with what to install, unless /usr/bin/python3 can import numpy and skrf.
 *
 * @example
 * beforeAll(() => requireReferencePython());
 */
export function requireReferencePython(): void {
  if (!existsSync(PYTHON)) throw new Error(`${PYTHON} not found; ${INSTALL_HINT}`);
  if (referenceSkrfVersion() === null) throw new Error(`cannot import numpy and skrf with ${PYTHON}; ${INSTALL_HINT}`);
}

/**
 * Runs Python code (or a script file) with /usr/bin/python3 after the shared prelude and returns stdout.
 *
 * @param script - Python source, or `{ file }` for a script on disk (run as __main__)
 * @param opts - stdin, argv, which libraries to import first, environment
 * @returns everything the script printed on stdout
 * @throws Error with the script's stderr when it exits non-zero, or what to install when Python is missing
 * @example runPython("print(np.linalg.norm([3, 4]))") // "5.0\n"
 */
export function runPython(script: string | { file: string }, opts: PythonOptions = {}): string {
  if (!existsSync(PYTHON)) throw new Error(`${PYTHON} not found; ${INSTALL_HINT}`);
  const prelude = `${opts.numpy === false && !opts.skrf ? "" : NUMPY_SHIM}${opts.skrf ? SKRF_IMPORT : ""}`;
  const body =
    typeof script === "string"
      ? script
      : `import runpy as _runpy, sys as _sys\n_sys.argv[0] = ${JSON.stringify(script.file)}\n_runpy.run_path(${JSON.stringify(script.file)}, run_name="__main__")\n`;
  const input = opts.input === undefined ? undefined : typeof opts.input === "string" ? opts.input : JSON.stringify(opts.input);
  const env = { ...process.env, MPLBACKEND: "Agg", MPLCONFIGDIR: "/tmp", ...opts.env };
  const run = spawnSync(PYTHON, ["-c", prelude + body, ...(opts.args ?? [])], { input, encoding: "utf8", maxBuffer: 1 << 30, env });
  if (run.error) throw run.error;
  if (run.status !== 0) {
    const what = typeof script === "string" ? "reference script" : script.file;
    const missing = /No module named '(numpy|skrf)'/.test(run.stderr) ? `; ${INSTALL_HINT}` : "";
    throw new Error(`${what} failed (exit ${run.status}): ${run.stderr}${missing}`);
  }
  return run.stdout;
}

/**
 * Runs Python like {@link runPython} and parses the last line it printed as JSON (libraries may print
 * notices before it).
 *
 * @param script - Python source or `{ file }`
 * @param input - JSON sent on stdin
 * @param opts - as for runPython
 * @example const out = runPythonJson<{ s: number[] }>({ file: SCRIPT }, { cases }, { skrf: true });
 */
export function runPythonJson<T>(script: string | { file: string }, input?: unknown, opts: Omit<PythonOptions, "input"> = {}): T {
  const lines = runPython(script, { ...opts, input }).trim().split("\n");
  return JSON.parse(lines[lines.length - 1]) as T;
}
