"""Dense reference timing for Portolan's benchmark: the same interconnection solved with numpy.

Usage: dense_numpy.py MANIFEST.json RUNS [BUDGET_SECONDS]
The manifest names a binary file of float64 values (every block's S, frequency-major, row-major,
interleaved re/im, blocks in order) and gives the block sizes, links, system ports and the frequency count.

Method (connection-scattering-matrix method; Gupta, Garg and Chadha, Computer-Aided Design of Microwave
Circuits, 1981): with b = S a for the block-diagonal S of all blocks, a_i = Gamma b_i for the linked ports
(Gamma the link permutation) and a = 0 at unlinked ports (matched terminations, so they are dropped),
  S_ext = S_ee + S_ei (Gamma - S_ii)^-1 S_ie
per frequency, solved with numpy.linalg.solve batched over chunks of frequencies. The timing covers
assembling the dense matrices from the block data, the solves and the products: not Python start-up,
not reading the manifest or the data file, not building the index maps. A first run shorter than one
second is an untimed warm-up (caches, page faults of fresh arrays), as on the Portolan side.
Prints JSON: { "runs_ms": [...], "median_ms": m, "median_cpu_ms": process CPU time median, "s": [nf][n][n][2] (from the last run), "numpy": version, "blas": ... }.
"""
import json
import sys
import time

import numpy as np


def blas_info():
    # the library actually mapped (Debian's libblas.so.3 is an alternative, e.g. OpenBLAS)
    try:
        with open("/proc/self/maps") as maps:
            libs = sorted({line.split()[-1] for line in maps if "blas" in line.lower() and "/" in line})
        if libs:
            return "BLAS " + ", ".join(libs)
    except OSError:
        pass
    try:
        cfg = np.__config__
        for name in ("blas_opt_info", "openblas_info", "blas_ilp64_opt_info"):
            info = getattr(cfg, name, None)
            if info:
                return "%s %s" % (name, ",".join(info.get("libraries", [])))
    except Exception:  # noqa: BLE001 - informational only
        pass
    return "unknown"


def threads_info():
    try:
        from threadpoolctl import threadpool_info  # type: ignore

        return threadpool_info()
    except ImportError:
        return "threadpoolctl not installed"


def main():
    manifest = json.load(open(sys.argv[1]))
    runs = int(sys.argv[2]) if len(sys.argv) > 2 else 7
    nf = manifest["nf"]
    flat = np.fromfile(manifest["data"], dtype="<f8")
    blocks = []
    offset = 0
    for n in manifest["block_ports"]:
        count = 2 * nf * n * n
        raw = flat[offset : offset + count].reshape(nf, n, n, 2)
        blocks.append(raw[..., 0] + 1j * raw[..., 1])
        offset += count
    links = manifest["links"]
    system = manifest["system_ports"]
    linked = sorted({p for link in links for p in link})
    pos_i = {p: k for k, p in enumerate(linked)}
    pos_e = {p: k for k, p in enumerate(system)}
    m, ne = len(linked), len(system)
    gamma = np.zeros((m, m))
    for p, q in links:
        gamma[pos_i[p], pos_i[q]] = 1.0
        gamma[pos_i[q], pos_i[p]] = 1.0
    # per block: which of its ports are internal (linked) or external (system), as local and dense indices
    scatter = []
    start = 0
    for s in blocks:
        n = s.shape[1]
        li = [k for k in range(n) if start + k in pos_i]
        le = [k for k in range(n) if start + k in pos_e]
        di = np.array([pos_i[start + k] for k in li], dtype=int)
        de = np.array([pos_e[start + k] for k in le], dtype=int)
        scatter.append((s, np.array(li, dtype=int), np.array(le, dtype=int), di, de))
        start += n
    chunk = max(1, min(nf, int(64e6 // max(1, (m * m * 16)))))

    def solve():
        out = np.empty((nf, ne, ne), dtype=complex)
        for k0 in range(0, nf, chunk):
            k1 = min(nf, k0 + chunk)
            c = k1 - k0
            sii = np.zeros((c, m, m), dtype=complex)
            sie = np.zeros((c, m, ne), dtype=complex)
            sei = np.zeros((c, ne, m), dtype=complex)
            see = np.zeros((c, ne, ne), dtype=complex)
            for s, li, le, di, de in scatter:
                blk = s[k0:k1]
                if len(li):
                    sii[:, di[:, None], di[None, :]] = blk[:, li[:, None], li[None, :]]
                if len(li) and len(le):
                    sie[:, di[:, None], de[None, :]] = blk[:, li[:, None], le[None, :]]
                    sei[:, de[:, None], di[None, :]] = blk[:, le[:, None], li[None, :]]
                if len(le):
                    see[:, de[:, None], de[None, :]] = blk[:, le[:, None], le[None, :]]
            x = np.linalg.solve(gamma[None, :, :] - sii, sie)
            out[k0:k1] = see + sei @ x
        return out

    # up to RUNS runs, fewer when one run is slow (the machine is shared): stop after BUDGET seconds
    budget = float(sys.argv[3]) if len(sys.argv) > 3 else 30.0
    times = []
    result = None
    cpu = []
    t0 = time.perf_counter()
    c0 = time.process_time()
    result = solve()
    first = (time.perf_counter() - t0) * 1e3
    first_cpu = (time.process_time() - c0) * 1e3
    warmed = first < 1000.0
    if not warmed:
        # a slow case: the first run counts (repeating it would take too long)
        times.append(first)
        cpu.append(first_cpu)
    started = time.perf_counter()
    for _ in range(runs - len(times)):
        t0 = time.perf_counter()
        c0 = time.process_time()
        result = solve()
        times.append((time.perf_counter() - t0) * 1e3)
        cpu.append((time.process_time() - c0) * 1e3)
        if time.perf_counter() - started > budget:
            break
    json.dump(
        {
            "runs_ms": times,
            "median_ms": float(np.median(times)),
            "median_cpu_ms": float(np.median(cpu)),
            "s": np.stack([result.real, result.imag], axis=-1).tolist(),
            "numpy": np.__version__,
            "blas": blas_info(),
            "threads": threads_info(),
            "interior": m,
            "warmup": warmed,
        },
        sys.stdout,
    )


if __name__ == "__main__":
    main()
