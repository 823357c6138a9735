"""Independent reference for borehole thermal resistances: the steady 2-D cross-section
(pipes in a grout disc inside infinite ground) solved by the method of fundamental solutions.

Nothing here uses the multipole method or its image formulas. The temperature is represented by

- grout (|z| < r_b):  sum over pipes of M point sources ln|z - s| placed on a circle of radius
  0.6 r_p inside each pipe, plus a harmonic polynomial sum_k Re/Im (z/r_b)^k, k = 0..K;
- ground (|z| > r_b): C ln(|z|/r_b) + sum_k Re/Im (r_b/z)^k, k = 1..K (no constant term, so the
  mean borehole-wall temperature T_b is 0);

and the unknown coefficients are fitted by least squares to the boundary conditions at
collocation points: continuity of temperature and of heat flux (lambda_b dT/dr = lambda dT/dr)
at r_b, and the pipe condition T_f = T - beta r_p dT/drho on every pipe surface
(beta = 2 pi lambda_b R_p). The heat flow from pipe n is q_n = -2 pi lambda_b (sum of its source
strengths). Solving with T_f = e_j gives the conductance matrix K (q = K T_f, T_b = 0); R = K^-1.

R_b = 1/(1^T K 1); R_a between the downward group D and the upward group U is
(a + b + 2c)/(a b - c^2) with a = 1_D^T K 1_D, b = 1_U^T K 1_U, c = 1_D^T K 1_U, i.e.
(T_D - T_U)/Q_D when Q_U = -Q_D.

Each case is solved at two discretisations; the relative change is written as a convergence
figure. Run:  python3 tests/reference/borehole_mfs.py  (writes borehole_mfs.csv beside it).
"""

import csv
import math
import os

import numpy as np


def layout(kind, shank_spacing, pairing):
    xc = shank_spacing / 2.0
    if kind == "single":
        return [complex(xc, 0.0), complex(-xc, 0.0)], [0], [1]
    pipes = [complex(xc, 0), complex(0, xc), complex(-xc, 0), complex(0, -xc)]
    if pairing == "diagonal":
        return pipes, [0, 1], [2, 3]
    return pipes, [0, 2], [1, 3]


def conductance_matrix(rb, rp, centres, lam_b, lam, rp_res, n_src, n_modes):
    beta = 2.0 * math.pi * lam_b * rp_res
    n_pipes = len(centres)
    n_col_pipe = 2 * n_src
    n_col_bore = 4 * n_src + 64
    # Unknown layout: pipe sources | grout polynomial (1 + 2K) | ground: ln + 2K
    n_unknown = n_pipes * n_src + (1 + 2 * n_modes) + (1 + 2 * n_modes)
    src_angles = 2 * math.pi * np.arange(n_src) / n_src
    sources = [z + 0.6 * rp * np.exp(1j * src_angles) for z in centres]
    g0 = n_pipes * n_src
    e0 = g0 + 1 + 2 * n_modes

    def grout_rows(z, normal):
        """Rows giving T and dT/dn (n = unit normal, complex) of the grout basis at points z."""
        m = len(z)
        t = np.zeros((m, n_unknown))
        dn = np.zeros((m, n_unknown))
        for p, s_all in enumerate(sources):
            for i, s in enumerate(s_all):
                d = z - s
                t[:, p * n_src + i] = np.log(np.abs(d))
                dn[:, p * n_src + i] = np.real(d * np.conj(normal)) / np.abs(d) ** 2
        t[:, g0] = 1.0
        for k in range(1, n_modes + 1):
            g = (z / rb) ** k
            gp = k * z ** (k - 1) / rb**k
            t[:, g0 + 2 * k - 1] = g.real
            t[:, g0 + 2 * k] = g.imag
            dn[:, g0 + 2 * k - 1] = np.real(gp * normal)
            dn[:, g0 + 2 * k] = np.imag(gp * normal)
        return t, dn

    def ground_rows(z, normal):
        m = len(z)
        t = np.zeros((m, n_unknown))
        dn = np.zeros((m, n_unknown))
        t[:, e0] = np.log(np.abs(z) / rb)
        dn[:, e0] = np.real(z * np.conj(normal)) / np.abs(z) ** 2
        for k in range(1, n_modes + 1):
            g = (rb / z) ** k
            gp = -k * rb**k * z ** (-k - 1)
            t[:, e0 + 2 * k - 1] = g.real
            t[:, e0 + 2 * k] = g.imag
            dn[:, e0 + 2 * k - 1] = np.real(gp * normal)
            dn[:, e0 + 2 * k] = np.imag(gp * normal)
        return t, dn

    phi = 2 * math.pi * (np.arange(n_col_bore) + 0.5) / n_col_bore
    zb = rb * np.exp(1j * phi)
    nb = np.exp(1j * phi)
    tg, dg = grout_rows(zb, nb)
    te, de = ground_rows(zb, nb)
    rows = [tg - te, (lam_b * dg - lam * de) * rb / lam_b]
    rhs_blocks = [np.zeros(n_col_bore), np.zeros(n_col_bore)]
    pipe_row_sets = []
    psi = 2 * math.pi * (np.arange(n_col_pipe) + 0.5) / n_col_pipe
    for zc in centres:
        zp = zc + rp * np.exp(1j * psi)
        tp, dp = grout_rows(zp, np.exp(1j * psi))
        rows.append(tp - beta * rp * dp)
        pipe_row_sets.append(len(rhs_blocks))
        rhs_blocks.append(np.zeros(n_col_pipe))
    a = np.vstack(rows)
    conductance = np.zeros((n_pipes, n_pipes))
    for j in range(n_pipes):
        rhs = [b.copy() for b in rhs_blocks]
        rhs[pipe_row_sets[j]][:] = 1.0
        x, *_ = np.linalg.lstsq(a, np.concatenate(rhs), rcond=None)
        for n in range(n_pipes):
            conductance[n, j] = -2 * math.pi * lam_b * x[n * n_src : (n + 1) * n_src].sum()
    return 0.5 * (conductance + conductance.T)


def resistances(k, down, up):
    rb = 1.0 / k.sum()
    a = k[np.ix_(down, down)].sum()
    b = k[np.ix_(up, up)].sum()
    c = k[np.ix_(down, up)].sum()
    ra = (a + b + 2 * c) / (a * b - c * c)
    return rb, ra


CASES = [
    # kind, pairing, r_b, r_p, shank spacing, lambda_b, lambda, R_p
    ("single", "none", 0.075, 0.016, 0.070, 1.5, 2.5, 0.05),
    ("single", "none", 0.075, 0.016, 0.050, 1.5, 2.5, 0.05),
    ("single", "none", 0.075, 0.016, 0.100, 1.5, 2.5, 0.05),
    ("single", "none", 0.075, 0.016, 0.100, 0.8, 3.5, 0.08),
    ("single", "none", 0.075, 0.016, 0.070, 3.0, 1.5, 0.02),
    ("single", "none", 0.075, 0.016, 0.070, 1.5, 2.5, 0.0),
    ("single", "none", 0.060, 0.020, 0.060, 2.0, 2.0, 0.12),
    ("single", "none", 0.075, 0.016, 0.115, 1.5, 2.5, 0.05),
    ("single", "none", 0.075, 0.016, 0.034, 1.0, 3.0, 0.05),
    ("double", "diagonal", 0.070, 0.016, 0.080, 1.5, 2.5, 0.06),
    ("double", "adjacent", 0.070, 0.016, 0.080, 1.5, 2.5, 0.06),
    ("double", "diagonal", 0.070, 0.016, 0.105, 2.5, 1.5, 0.02),
    ("double", "adjacent", 0.070, 0.016, 0.105, 0.9, 3.0, 0.10),
]


def main():
    out = os.path.join(os.path.dirname(os.path.abspath(__file__)), "borehole_mfs.csv")
    with open(out, "w", newline="") as f:
        w = csv.writer(f)
        w.writerow(
            [
                "kind",
                "pairing",
                "borehole_radius_m",
                "pipe_outer_radius_m",
                "shank_spacing_m",
                "grout_w_m_k",
                "ground_w_m_k",
                "pipe_resistance_m_k_per_w",
                "rb_m_k_per_w",
                "ra_m_k_per_w",
                "self_convergence_rel",
            ]
        )
        for kind, pairing, rb, rp, s, lb, lam, rpr in CASES:
            centres, down, up = layout(kind, s, pairing)
            coarse = resistances(conductance_matrix(rb, rp, centres, lb, lam, rpr, 48, 60), down, up)
            fine = resistances(conductance_matrix(rb, rp, centres, lb, lam, rpr, 96, 120), down, up)
            change = max(abs(fine[0] / coarse[0] - 1), abs(fine[1] / coarse[1] - 1))
            print(kind, pairing, s, lb, lam, rpr, "R_b = %.8f  R_a = %.8f  change %.1e" % (fine + (change,)))
            w.writerow([kind, pairing, rb, rp, s, lb, lam, rpr, "%.10f" % fine[0], "%.10f" % fine[1], "%.2e" % change])


if __name__ == "__main__":
    main()
