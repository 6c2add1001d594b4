/**
 * Running the reference scripts with Debian's /usr/bin/python3 (numpy + scikit-rf 0.15.4).
 * A missing interpreter or library is an error that says what to install: the reference tests do not skip.
 */
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";

export const PYTHON = "/usr/bin/python3";

const INSTALL_HINT =
  "the scikit-rf reference tests need Debian's /usr/bin/python3 with numpy and scikit-rf 0.15.4: " +
  "install them with `apt-get install -y python3 python3-numpy python3-scikit-rf` (the README's test command does this)";

/**
 * Throws, with what to install, unless /usr/bin/python3 can import numpy and skrf.
 *
 * @example
 * requireReferencePython(); // in beforeAll
 */
export function requireReferencePython(): void {
  if (!existsSync(PYTHON)) throw new Error(`${PYTHON} not found; ${INSTALL_HINT}`);
  const probe = spawnSync(
    PYTHON,
    ["-c", "import contextlib, sys, numpy as np\nnp.complex = complex; np.float = float; np.int = int\nwith contextlib.redirect_stdout(sys.stderr):\n    import skrf\nprint(skrf.__version__)"],
    { encoding: "utf8" },
  );
  if (probe.status !== 0) throw new Error(`cannot import numpy/skrf with ${PYTHON} (${probe.stderr.trim().split("\n").pop()}); ${INSTALL_HINT}`);
}

/**
 * Runs a Python script with a JSON document on stdin and parses the JSON it prints.
 *
 * @param script - absolute path of the script
 * @param input - serialised to stdin
 * @param env - extra environment variables
 */
export function runPythonJson<T>(script: string, input: unknown, env: NodeJS.ProcessEnv = process.env): T {
  const run = spawnSync(PYTHON, [script], { input: JSON.stringify(input), encoding: "utf8", maxBuffer: 1 << 30, env });
  if (run.status !== 0) throw new Error(`${script} failed (exit ${run.status}): ${run.stderr}`);
  return JSON.parse(run.stdout) as T;
}
