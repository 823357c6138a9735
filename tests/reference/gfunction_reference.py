"""Reference data for tests/gfunction.rs, computed independently with SciPy.

Run:  python3 -m venv .venv && .venv/bin/pip install numpy scipy
      .venv/bin/python tests/reference/gfunction_reference.py
Writes tests/reference/gfunction_single.csv and tests/reference/gfunction_fields.csv.

1. One borehole, uniform heat flux: the finite line source mean-wall integral in the form of
   Claesson & Javed (2011), ASHRAE Trans. 117(2):
       g(t) = 1/(2H) * int_{1/sqrt(4 a t)}^inf exp(-r^2 s^2)/s^2 * f(s) ds,
       f = 2 ierf(Hs) + 2 ierf((H+2D)s) - ierf(2(H+D)s) - ierf(2Ds),
   with scipy.integrate.quad; checked here against a direct double integral of the point
   source erfc(rho/sqrt(4at))/rho over source and receiver (dblquad) at one time.
   Also: the infinite line source 0.5*E1(r^2/(4at)) (scipy.special.exp1), the infinite
   cylinder source at the wall (Carslaw & Jaeger sec. 13.7) with scipy.special.j1/y1 and quad,
   and the steady finite line source in closed form (t -> infinity, double integral of 1/rho).
2. Small fields, uniform borehole-wall temperature: a dense, straightforward implementation
   (every segment pair, no symmetry, no tables): segment-to-segment FLS responses (Cimmino &
   Bernier 2014) by scipy.integrate.quad_vec at every time difference t_k - t_{k'-1}, heat rates
   piecewise constant between the given times, numpy.linalg.solve at each step.
"""
import csv
import math
import os

import numpy as np
from scipy import integrate, special

HERE = os.path.dirname(os.path.abspath(__file__))


def ierf(x):
    return x * special.erf(x) - (1.0 - np.exp(-x * x)) / math.sqrt(math.pi)


# ---------------------------------------------------------------- single borehole

def fls_single(t, alpha, H, D, r):
    def f(s):
        return (2 * ierf(H * s) + 2 * ierf((H + 2 * D) * s)
                - ierf(2 * (H + D) * s) - ierf(2 * D * s))

    def integrand(s):
        return math.exp(-r * r * s * s) / (s * s) * f(s)

    s0 = 1.0 / math.sqrt(4 * alpha * t)
    # split at a few scales so quad sees each feature
    cuts = sorted({s0, max(s0, 1.0 / H), max(s0, 1.0 / r), max(s0, 10.0 / r)})
    total = 0.0
    for a, b in zip(cuts[:-1], cuts[1:]):
        if b > a:
            total += integrate.quad(integrand, a, b, epsabs=0, epsrel=1e-12, limit=400)[0]
    total += integrate.quad(integrand, cuts[-1], np.inf, epsabs=0, epsrel=1e-12, limit=400)[0]
    return total / (2 * H)


def fls_double_integral(t, alpha, H, D, r):
    """Mean over the receiver (the borehole wall line at distance r) of the point-source field
    of the source line and its negative image, integrated directly: an independent check."""
    c = math.sqrt(4 * alpha * t)

    def kernel(zp, z):
        rho1 = math.hypot(r, z - zp)
        rho2 = math.hypot(r, z + zp)
        return special.erfc(rho1 / c) / rho1 - special.erfc(rho2 / c) / rho2

    # g = 2 pi k dT / q' = (1/2) * (1/H) * double integral
    val = integrate.dblquad(kernel, D, D + H, D, D + H, epsabs=1e-10, epsrel=1e-9)[0]
    return 0.5 * val / H


def ils(fo):
    return 0.5 * special.exp1(1.0 / (4.0 * fo))


def cylinder_source(fo):
    def integrand(b):
        return (-np.expm1(-b * b * fo)) / (b ** 3 * (special.j1(b) ** 2 + special.y1(b) ** 2))

    edges = [0.0] + list(np.geomspace(1e-8, 1e4, 60))
    total = sum(integrate.quad(integrand, a, b, epsabs=0, epsrel=1e-11, limit=200)[0]
                for a, b in zip(edges[:-1], edges[1:]))
    total += integrate.quad(integrand, 1e4, np.inf, epsabs=1e-14, epsrel=1e-10, limit=200)[0]
    return 4.0 / math.pi ** 2 * total


def steady_fls(H, D, r):
    """t -> infinity: (1/(2H)) * int int [1/rho - 1/rho_image] dz dz' in closed form with
    F(u) = u asinh(u/r) - sqrt(u^2 + r^2); segments [a,b] (receiver) and [c,d] (source)."""
    def F(u):
        return u * math.asinh(u / r) - math.sqrt(u * u + r * r)

    def pair(a, b, c, d):
        return F(b - c) + F(a - d) - F(b - d) - F(a - c)

    real = pair(D, D + H, D, D + H)
    image = pair(D, D + H, -D - H, -D)
    return 0.5 * (real - image) / H


def write_single():
    alpha, H, D, r = 1e-6, 150.0, 4.0, 0.07
    ts = H * H / (9 * alpha)
    check_t = ts * math.exp(-4)
    single, double = fls_single(check_t, alpha, H, D, r), fls_double_integral(check_t, alpha, H, D, r)
    assert abs(single / double - 1) < 1e-6, (single, double)
    print(f"single integral {single:.10f} vs double integral {double:.10f}")
    rows = []
    for i in range(40):
        x = -10 + 13 * i / 39
        t = ts * math.exp(x)
        fo = alpha * t / (r * r)
        rows.append((x, t, fls_single(t, alpha, H, D, r), ils(fo), cylinder_source(fo)))
    steady = steady_fls(H, D, r)
    with open(os.path.join(HERE, "gfunction_single.csv"), "w", newline="") as fh:
        w = csv.writer(fh)
        fh.write(f"# one borehole H={H} m D={D} m r_b={r} m alpha={alpha} m2/s; steady FLS g = {steady:.12f}\n")
        w.writerow(["ln_t_ts", "t_s", "g_fls", "g_ils", "g_cylinder"])
        for row in rows:
            w.writerow([f"{v:.12g}" for v in row])
        w.writerow(["inf", "inf", f"{steady:.12g}", "", ""])


# ---------------------------------------------------------------- small fields, UBWT

def segment_geometry(positions, H, D, segments):
    L = H / segments
    xs, ys, tops = [], [], []
    for (x, y) in positions:
        for q in range(segments):
            xs.append(x)
            ys.append(y)
            tops.append(D + q * L)
    return np.array(xs), np.array(ys), np.array(tops), L


def response_matrix(tau, alpha, xs, ys, tops, L, r):
    """h[i, j]: mean temperature on segment i per unit heat rate per length on segment j."""
    n = len(xs)
    dist = np.hypot(xs[:, None] - xs[None, :], ys[:, None] - ys[None, :])
    same_borehole = (xs[:, None] == xs[None, :]) & (ys[:, None] == ys[None, :])
    dist = np.where(same_borehole, r, dist).ravel()
    d2, d1 = np.meshgrid(tops, tops, indexing="ij")  # receiver top (rows), source top (cols)
    d2 = d2.ravel()
    d1 = d1.ravel()

    def integrand(s):
        real = (ierf((d2 - d1 + L) * s) - ierf((d2 - d1) * s)
                + ierf((d2 - d1 - L) * s) - ierf((d2 - d1) * s))
        image = (ierf((d1 + d2 + L) * s) - ierf((d1 + d2) * s)
                 + ierf((d1 + d2 + L) * s) - ierf((d1 + d2 + 2 * L) * s))
        return np.exp(-dist * dist * s * s) / (s * s) * (real + image)

    s0 = 1.0 / math.sqrt(4 * alpha * tau)
    edges = [s0] + [v for v in (1.0 / L, 1.0 / r, 8.0 / r) if v > s0]
    total = np.zeros(n * n)
    for a, b in zip(edges[:-1], edges[1:]):
        total += integrate.quad_vec(integrand, a, b, epsabs=1e-13, epsrel=1e-10)[0]
    if edges[-1] < 8.0 / r:
        total += integrate.quad_vec(integrand, edges[-1], 8.0 / r, epsabs=1e-13, epsrel=1e-10)[0]
    return (total / (2 * L)).reshape(n, n)


def ubwt(times, alpha, positions, H, D, r, segments):
    xs, ys, tops, L = segment_geometry(positions, H, D, segments)
    n = len(xs)
    cache = {}

    def h(tau):
        key = round(tau, 6)
        if key not in cache:
            cache[key] = response_matrix(tau, alpha, xs, ys, tops, L, r)
        return cache[key]

    q_prev = np.zeros(n)
    increments = []
    g = []
    for k, t in enumerate(times):
        starts = [0.0] + list(times[:k])
        A = h(t - starts[k])
        rhs = A @ q_prev
        for kp, dq in enumerate(increments):
            rhs -= h(t - starts[kp]) @ dq
        M = np.zeros((n + 1, n + 1))
        M[:n, :n] = A
        M[:n, n] = -1.0
        M[n, :n] = L
        b = np.append(rhs, n * L)
        x = np.linalg.solve(M, b)
        increments.append(x[:n] - q_prev)
        q_prev = x[:n]
        g.append(x[n])
    return g


def uhf(times, alpha, positions, H, D, r):
    xs, ys, tops, L = segment_geometry(positions, H, D, 1)
    return [response_matrix(t, alpha, xs, ys, tops, L, r).sum(axis=1).mean() for t in times]


def write_fields():
    alpha, H, D, r = 1e-6, 100.0, 2.0, 0.05
    ts = H * H / (9 * alpha)
    lnt = np.linspace(-8.0, 3.0, 12)
    times = list(ts * np.exp(lnt))
    cases = [("2x2", 2, 2, 5.0, 12), ("2x2", 2, 2, 10.0, 12), ("3x3", 3, 3, 5.0, 8), ("3x3", 3, 3, 10.0, 8)]
    with open(os.path.join(HERE, "gfunction_fields.csv"), "w", newline="") as fh:
        fh.write(f"# fields: H={H} m D={D} m r_b={r} m alpha={alpha} m2/s, pure finite line sources\n")
        w = csv.writer(fh)
        w.writerow(["field", "rows", "columns", "spacing_m", "segments", "ln_t_ts", "t_s", "g_ubwt", "g_uhf"])
        for name, rows, cols, B, segments in cases:
            positions = [(c * B, rr * B) for rr in range(rows) for c in range(cols)]
            g = ubwt(times, alpha, positions, H, D, r, segments)
            gu = uhf(times, alpha, positions, H, D, r)
            print(name, B, [f"{v:.4f}" for v in g])
            for x, t, a, b in zip(lnt, times, g, gu):
                w.writerow([name, rows, cols, B, segments, f"{x:.12g}", f"{t:.12g}", f"{a:.12g}", f"{b:.12g}"])


if __name__ == "__main__":
    write_single()
    write_fields()
