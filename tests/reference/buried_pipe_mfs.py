"""Independent numerical reference for steady heat loss of buried pipes.

Method: the method of fundamental solutions (a boundary-collocation method; Fairweather &
Karageorghis, "The method of fundamental solutions for elliptic boundary value problems",
Adv. Comput. Math. 9, 1998). Each region's temperature is a sum of logarithmic line sources
placed OUTSIDE that region, so it satisfies Laplace's equation exactly; the source strengths are
fitted by least squares (numpy.linalg.lstsq) to the boundary and interface conditions on many
collocation points. No multipole expansion, no resistance formula and no shape factor is used, so
the results are independent of the closed forms in src/physics/buried_pipe/.

Geometry: x across, z down, the (effective) ground surface at z = 0 held at 0 (the undisturbed
ground temperature is the datum, so every temperature below is an excess over it).

- ground region (conductivity kg): sources inside each casing (or bare pipe), each paired with its
  negative image above the surface, so T = 0 on z = 0 exactly:
      T_g(p) = sum_j b_j ln(|p - s_j*| / |p - s_j|),   heat from source j = 2 pi kg b_j
- insulation region of a casing (conductivity ki): sources on a ring outside the casing and on a
  ring inside every carrier, plus a constant:
      T_i(p) = C + sum_j a_j (-ln |p - t_j|),   heat from a carrier = 2 pi ki sum_(its ring) a_j
- conditions: T_i = T_carrier on each carrier (isothermal carrier surface, no wall resistance);
  T_i = T_g and ki dT_i/dn = kg dT_g/dn on each casing (perfect contact); T_g = T_pipe on a
  bare pipe.

A Robin surface (surface resistance R0) is handled for a bare pipe with the exact Green's function
of the half-space with a convective boundary (source, its image, and a continuous line of images
with density 2 beta exp(-beta s), beta = 1/(kg R0); see Carslaw & Jaeger, Conduction of Heat in
Solids, 2nd ed. 1959, section 10.10 (method of images for the radiation condition), evaluated
with scipy.integrate.quad).

Every case is solved at two resolutions; the output carries both and the Rust tests check that
they agree (the reference's own convergence) before using the finer one.

Run: .venv/bin/python tests/reference/buried_pipe_mfs.py > tests/reference/buried_pipe_mfs.csv
"""
import math

import numpy as np
from scipy.integrate import quad


def ring(cx, cz, radius, n, phase=0.0):
    th = phase + 2.0 * math.pi * np.arange(n) / n
    return np.stack([cx + radius * np.cos(th), cz + radius * np.sin(th)], axis=1)


def normals(cx, cz, pts):
    d = pts - np.array([cx, cz])
    return d / np.linalg.norm(d, axis=1)[:, None]


def g_free(p, s):
    """-ln|p - s| and its gradient with respect to p (rows: points, columns: sources)."""
    d = p[:, None, :] - s[None, :, :]
    r2 = np.sum(d * d, axis=2)
    return -0.5 * np.log(r2), -d / r2[:, :, None]


def g_half(p, s):
    """ln(|p - s*|/|p - s|), s* the mirror of s in z = 0, and its gradient."""
    img = s * np.array([1.0, -1.0])
    v0, g0 = g_free(p, s)
    v1, g1 = g_free(p, img)
    return v0 - v1, g0 - g1


def solve(casings, bare, kg, n, probes=()):
    """casings: list of dict(cx, cz, rc, ki, carriers=[(x, z, r, T)]); bare: list of (x, z, r, T).

    Returns heat rates (W/m) of every carrier (casing order) then every bare pipe, and the
    relative rms residual of the collocation; with probes (points in the ground), also the
    ground temperatures there."""
    blocks = []  # unknown blocks: ("g", casing/bare index, sources) or ("i", casing, sources, carrier)
    cols = 0
    layout = []
    for ci, c in enumerate(casings):
        src = ring(c["cx"], c["cz"], 0.6 * c["rc"], n, 0.5)
        layout.append(("g", ci, src, cols))
        cols += len(src)
    for bi, (x, z, r, _t) in enumerate(bare):
        src = ring(x, z, 0.6 * r, n, 0.5)
        layout.append(("gb", bi, src, cols))
        cols += len(src)
    for ci, c in enumerate(casings):
        src = ring(c["cx"], c["cz"], 1.5 * c["rc"], n, 0.5)
        layout.append(("io", ci, src, cols))
        cols += len(src)
        for pi, (x, z, r, _t) in enumerate(c["carriers"]):
            src = ring(x, z, 0.55 * r, n, 0.5)
            layout.append(("ic", (ci, pi), src, cols))
            cols += len(src)
        layout.append(("const", ci, None, cols))
        cols += 1

    ground_blocks = [b for b in layout if b[0] in ("g", "gb")]

    def ins_blocks(ci):
        return [b for b in layout if b[0] in ("io", "ic", "const") and (b[1] == ci or (b[0] == "ic" and b[1][0] == ci))]

    rows, rhs = [], []
    m = 3 * n  # collocation points per circle

    def ground_row(p, nrm):
        val = np.zeros((len(p), cols))
        der = np.zeros((len(p), cols))
        for _k, _i, src, c0 in ground_blocks:
            v, g = g_half(p, src)
            val[:, c0 : c0 + len(src)] = v
            if nrm is not None:
                der[:, c0 : c0 + len(src)] = np.einsum("ijk,ik->ij", g, nrm)
        return val, der

    def ins_row(ci, p, nrm):
        val = np.zeros((len(p), cols))
        der = np.zeros((len(p), cols))
        for kind, _i, src, c0 in ins_blocks(ci):
            if kind == "const":
                val[:, c0] = 1.0
                continue
            v, g = g_free(p, src)
            val[:, c0 : c0 + len(src)] = v
            if nrm is not None:
                der[:, c0 : c0 + len(src)] = np.einsum("ijk,ik->ij", g, nrm)
        return val, der

    for ci, c in enumerate(casings):
        p = ring(c["cx"], c["cz"], c["rc"], m)
        nrm = normals(c["cx"], c["cz"], p)
        gv, gd = ground_row(p, nrm)
        iv, idr = ins_row(ci, p, nrm)
        rows.append(iv - gv)
        rhs.append(np.zeros(len(p)))
        rows.append((c["ki"] * idr - kg * gd) * c["rc"] / kg)
        rhs.append(np.zeros(len(p)))
        for x, z, r, t in c["carriers"]:
            q = ring(x, z, r, m)
            iv, _ = ins_row(ci, q, None)
            rows.append(iv)
            rhs.append(np.full(len(q), t))
    for x, z, r, t in bare:
        q = ring(x, z, r, m)
        gv, _ = ground_row(q, None)
        rows.append(gv)
        rhs.append(np.full(len(q), t))
    a = np.vstack(rows)
    b = np.concatenate(rhs)
    sol, *_ = np.linalg.lstsq(a, b, rcond=None)
    resid = np.linalg.norm(a @ sol - b) / np.linalg.norm(b)
    heats = []
    for ci, c in enumerate(casings):
        for pi in range(len(c["carriers"])):
            blk = [bl for bl in layout if bl[0] == "ic" and bl[1] == (ci, pi)][0]
            heats.append(2.0 * math.pi * c["ki"] * sol[blk[3] : blk[3] + len(blk[2])].sum())
    for bi in range(len(bare)):
        blk = [bl for bl in layout if bl[0] == "gb" and bl[1] == bi][0]
        heats.append(2.0 * math.pi * kg * sol[blk[3] : blk[3] + len(blk[2])].sum())
    if probes:
        gv, _ = ground_row(np.array(probes, dtype=float), None)
        return heats, resid, gv @ sol
    return heats, resid


def robin_green(px, pz, sx, sz, beta):
    """Half-space z > 0 with dT/dz = beta T on z = 0 (heat leaves through a surface resistance
    R0 = 1/(k beta) to a datum of 0): potential of a unit source (T = q/(2 pi k) * this)."""
    def lnr(zz):
        return math.log(math.hypot(px - sx, pz - zz))

    tail, _ = quad(lambda s: 2.0 * beta * math.exp(-beta * s) * lnr(-sz - s), 0.0, math.inf, limit=200)
    return -lnr(sz) - lnr(-sz) + tail


def robin_bare_pipe(r, h, kg, r0, n):
    beta = 1.0 / (kg * r0)
    src = ring(0.0, h, 0.6 * r, n, 0.5)
    col = ring(0.0, h, r, 3 * n)
    a = np.array([[robin_green(p[0], p[1], s[0], s[1], beta) for s in src] for p in col])
    b = np.ones(len(col))
    sol, *_ = np.linalg.lstsq(a, b, rcond=None)
    resid = np.linalg.norm(a @ sol - b) / np.linalg.norm(b)
    return 2.0 * math.pi * kg * sol.sum(), resid


def emit(case, quantity, coarse, fine, resid):
    print(f"{case},{quantity},{coarse:.10g},{fine:.10g},{resid:.3g}")


def main():
    print("# Method of fundamental solutions (boundary collocation) with numpy.linalg.lstsq;")
    print("# generated by tests/reference/buried_pipe_mfs.py. Temperatures are excesses over the")
    print("# undisturbed ground; heat rates in W/m; resistances in m K/W.")
    print("case,quantity,coarse,fine,rel_residual")
    kg = 1.5
    # A: bare isothermal cylinder r = 0.1 m under an isothermal surface: R = 1/q for T = 1 K.
    for h in (0.15, 0.3, 1.0, 3.0):
        (qc,), _ = solve([], [(0.0, h, 0.1, 1.0)], kg, 24)
        (qf,), res = solve([], [(0.0, h, 0.1, 1.0)], kg, 48)
        emit(f"bare_r0.1_h{h}", "resistance_m_k_per_w", 1.0 / qc, 1.0 / qf, res)
    # B: the same cylinder (H = 1 m) under a surface resistance R0 = 0.0685 m2K/W (Robin surface).
    for r0 in (0.0685, 0.2):
        qc, _ = robin_bare_pipe(0.1, 1.0, kg, r0, 16)
        qf, res = robin_bare_pipe(0.1, 1.0, kg, r0, 32)
        emit(f"robin_r0.1_h1.0_R0{r0}", "resistance_m_k_per_w", 1.0 / qc, 1.0 / qf, res)
    # C: single insulated pipe: carrier r 0.05715 (114.3 mm) at 70 K, PUR 0.027 to r 0.1, H = 1 m.
    single = dict(cx=0.0, cz=1.0, rc=0.1, ki=0.027, carriers=[(0.0, 1.0, 0.05715, 70.0)])
    (qc,), _ = solve([single], [], kg, 24)
    (qf,), res = solve([single], [], kg, 48)
    emit("single_insulated", "heat_w_per_m", qc, qf, res)

    # D: a pair in one trench: supply 70 K, return 40 K (80/50 C over 10 C ground).
    def pair(e, hs, hr, rps, rcs, rpr, rcr):
        s = dict(cx=-e / 2, cz=hs, rc=rcs, ki=0.027, carriers=[(-e / 2, hs, rps, 70.0)])
        r = dict(cx=e / 2, cz=hr, rc=rcr, ki=0.027, carriers=[(e / 2, hr, rpr, 40.0)])
        return [s, r]

    for name, args in (
        ("pair_equal", (0.35, 1.0, 1.0, 0.05715, 0.1, 0.05715, 0.1)),
        ("pair_close", (0.22, 0.6, 0.6, 0.05715, 0.1, 0.05715, 0.1)),
        ("pair_mixed", (0.4, 1.1, 0.9, 0.0695, 0.125, 0.04445, 0.09)),
    ):
        qc, _ = solve(pair(*args), [], kg, 24)
        qf, res = solve(pair(*args), [], kg, 48)
        emit(name, "supply_heat_w_per_m", qc[0], qf[0], res)
        emit(name, "return_heat_w_per_m", qc[1], qf[1], res)

    # Soil temperature rise (K) at points beside the equal pair (e.g. a water main).
    probes = [(0.6, 1.0), (1.0, 1.0), (2.0, 1.0), (0.0, 0.4), (0.0, 2.0), (1.0, 0.5)]
    *_, tc = solve(pair(0.35, 1.0, 1.0, 0.05715, 0.1, 0.05715, 0.1), [], kg, 24, probes)
    *_, tf = solve(pair(0.35, 1.0, 1.0, 0.05715, 0.1, 0.05715, 0.1), [], kg, 48, probes)
    for (x, z), a, b in zip(probes, tc, tf):
        emit(f"pair_equal_probe_x{x}_z{z}", "rise_k", a, b, 0.0)

    # E: twin pipes: two carriers in one casing (insulation 0.027, ground 1.5). Supply 72 K,
    # return 42 K over the undisturbed ground (80/50 C over 8 C).
    def twin(rc, rp, d, h, vertical):
        if vertical:
            c1, c2 = (0.0, h - d), (0.0, h + d)
        else:
            c1, c2 = (-d, h), (d, h)
        return dict(cx=0.0, cz=h, rc=rc, ki=0.027, carriers=[(c1[0], c1[1], rp, 72.0), (c2[0], c2[1], rp, 42.0)])

    for name, args in (
        ("twin_dn50", (0.1091, 0.03015, 0.04015, 0.8, False)),
        ("twin_dn50_vertical", (0.1091, 0.03015, 0.04015, 0.8, True)),
        ("twin_dn100", (0.1716, 0.05715, 0.0756, 1.0, False)),
        ("twin_tight", (0.0784, 0.02415, 0.0351, 0.7, False)),
    ):
        qc, _ = solve([twin(*args)], [], kg, 32)
        qf, res = solve([twin(*args)], [], kg, 64)
        emit(name, "supply_heat_w_per_m", qc[0], qf[0], res)
        emit(name, "return_heat_w_per_m", qc[1], qf[1], res)


if __name__ == "__main__":
    main()
