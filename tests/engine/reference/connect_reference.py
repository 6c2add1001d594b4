"""Reference interconnection for Portolan's tests, computed with scikit-rf.

Reads a JSON description of a system on stdin and prints the composite S-parameters as JSON.

Input (one case, or { "cases": [case, ...] } answered by { "results": [s, ...] }):
  { "system_z0": 50,
    "blocks": [ { "z0": [per-port real ohms], "s": [nf][n][n][2] } ],   # each block's S, own references
    "links": [[p, q], ...],          # global block-port indices (blocks in order, ports in order)
    "ports": [ { "at": p, "z0": ohms } ] }
Output:
  { "s": [nf][m][m][2] }  composite over the system ports, each referenced to its own z0

Method: every block is renormalised to system_z0 (direct formula below), then the links are made one at
a time with scikit-rf 0.15.4's skrf.network.connect_s (two separate networks; resulting ports are A
without k, then B without l) and innerconnect_s (two ports of one network), after Compton and Rutledge,
"Perspectives in microwave circuit analysis" (1989) as implemented by scikit-rf. Ports that are neither
linked nor system ports see a matched termination (incident wave zero), so their rows and columns are
dropped. Finally every system port is renormalised from system_z0 to its own z0.

Renormalisation (real references): with V = sqrt(Z)(a + b), I = (a - b)/sqrt(Z) (Kurokawa 1965 power
waves; for real references power waves and pseudo-waves coincide, Marks and Williams 1992),
  a' = P a + Q b,  b' = Q a + P b,  P = (Z + Z')/(2 sqrt(Z Z')),  Q = (Z - Z')/(2 sqrt(Z Z')),
so S' = (Q + P S)(P + Q S)^-1. scikit-rf's own renormalize is not used: it goes through the Z-matrix,
which does not exist for series elements (see SETUP-NOTES).
"""
import contextlib
import json
import sys

import numpy as np

# scikit-rf 0.15.4 uses aliases removed from recent numpy
np.complex = complex
np.float = float
np.int = int
# scikit-rf prints a note about matplotlib on stdout at import; keep stdout for the JSON answer
with contextlib.redirect_stdout(sys.stderr):
    import skrf  # noqa: E402
    from skrf.network import connect_s, innerconnect_s  # noqa: E402


def to_complex(arr):
    a = np.asarray(arr, dtype=float)
    return a[..., 0] + 1j * a[..., 1]


def renormalise(s, z_old, z_new):
    """S referenced to real z_old (per port) -> referenced to real z_new (per port)."""
    z_old = np.asarray(z_old, dtype=float)
    z_new = np.asarray(z_new, dtype=float)
    if np.all(z_old == z_new):
        return s
    root = 2.0 * np.sqrt(z_old * z_new)
    p = np.diag((z_old + z_new) / root)
    q = np.diag((z_old - z_new) / root)
    num = q[None, :, :] + p[None, :, :] @ s
    den = p[None, :, :] + q[None, :, :] @ s
    # S' = num @ den^-1, i.e. solve S' den = num  <=>  den^T S'^T = num^T
    return np.swapaxes(np.linalg.solve(np.swapaxes(den, 1, 2), np.swapaxes(num, 1, 2)), 1, 2)


def solve_case(spec):
    z0 = float(spec["system_z0"])
    components = []  # each: [S (nf, m, m), [global port ids]]
    owner = {}
    offset = 0
    for block in spec["blocks"]:
        s = to_complex(block["s"])
        n = s.shape[1]
        s = renormalise(s, block["z0"], [z0] * n)
        ports = list(range(offset, offset + n))
        comp = [s, ports]
        components.append(comp)
        for p in ports:
            owner[p] = comp
        offset += n
    for p, q in spec["links"]:
        cp, cq = owner[p], owner[q]
        if cp is cq:
            k, l = cp[1].index(p), cp[1].index(q)
            cp[0] = innerconnect_s(cp[0], k, l)
            cp[1] = [x for x in cp[1] if x not in (p, q)]
        else:
            k, l = cp[1].index(p), cq[1].index(q)
            merged = [connect_s(cp[0], k, cq[0], l), [x for x in cp[1] if x != p] + [x for x in cq[1] if x != q]]
            components = [c for c in components if c is not cp and c is not cq] + [merged]
            for x in merged[1]:
                owner[x] = merged
    sys_ports = spec["ports"]
    m = len(sys_ports)
    nf = components[0][0].shape[0]
    out = np.zeros((nf, m, m), dtype=complex)
    for i, pi in enumerate(sys_ports):
        for j, pj in enumerate(sys_ports):
            ci, cj = owner[pi["at"]], owner[pj["at"]]
            if ci is cj:
                out[:, i, j] = ci[0][:, ci[1].index(pi["at"]), ci[1].index(pj["at"])]
    out = renormalise(out, [z0] * m, [float(p["z0"]) for p in sys_ports])
    return np.stack([out.real, out.imag], axis=-1).tolist()


def main():
    spec = json.load(sys.stdin)
    if "cases" in spec:
        json.dump({"results": [solve_case(c) for c in spec["cases"]], "skrf": skrf.__version__}, sys.stdout)
    else:
        json.dump({"s": solve_case(spec), "skrf": skrf.__version__}, sys.stdout)


if __name__ == "__main__":
    main()
