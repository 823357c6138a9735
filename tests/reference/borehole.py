"""Reference temperature rises around a borehole with a constant heat rate q' (W/m).

Sources:
* Kelvin infinite line source, H. S. Carslaw & J. C. Jaeger, Conduction of Heat in
  Solids, 2nd ed., 1959, §10.4:  dT(r, t) = q'/(4 pi k) E1(r^2 / (4 alpha t)),
  with E1 from scipy.special.exp1.
* Infinite cylinder source with a constant flux q'/(2 pi r_b) at r = r_b into an
  infinite medium (Carslaw & Jaeger 1959 §13.7; L. R. Ingersoll, O. J. Zobel &
  A. C. Ingersoll, Heat Conduction, 1954):
      dT(r, t) = q'/k G(z, p),  z = alpha t / r_b^2,  p = r / r_b,
      G(z, p) = 1/pi^2 int_0^inf (exp(-b^2 z) - 1) / (J1(b)^2 + Y1(b)^2)
                        * (J0(p b) Y1(b) - J1(b) Y0(p b)) / b^2 db,
  integrated with scipy.integrate.quad (scipy.special.j0, j1, y0, y1).

The soil and borehole are invented demo data. Run: python3 borehole.py > borehole.csv
"""
import math

from scipy.integrate import quad
from scipy.special import exp1, j0, j1, y0, y1

k, c = 2.0, 2.0e6  # W/(m K), J/(m3 K)
r_b = 0.055  # m
q = 40.0  # W/m
alpha = k / c


def cylinder_g(z, p):
    def f(b):
        return (
            (math.exp(-b * b * z) - 1.0)
            / (j1(b) ** 2 + y1(b) ** 2)
            * (j0(p * b) * y1(b) - j1(b) * y0(p * b))
            / (b * b)
        )

    total = 0.0
    edges = [0.0, 1e-3, 1e-2, 0.1, 1.0, 10.0, 100.0, 1000.0]
    for a, b in zip(edges[:-1], edges[1:]):
        total += quad(f, a, b, limit=500, epsabs=1e-14, epsrel=1e-11)[0]
    total += quad(f, edges[-1], math.inf, limit=500)[0]
    return total / math.pi**2


print("# Borehole with constant heat rate: line source (C&J 10.4) and cylinder source (C&J 13.7); borehole.py (SciPy)")
for key, value in [("k_w_mk", k), ("c_j_m3k", c), ("radius_m", r_b), ("heat_rate_w_m", q)]:
    print(f"{key},{value!r}")
print("kind,r_m,time_s,rise_k")
for hours in [1.0, 2.0, 5.0, 10.0, 24.0]:
    t = hours * 3600.0
    print(f"0,{r_b!r},{t!r},{q / k * cylinder_g(alpha * t / r_b**2, 1.0)!r}")
for r in [r_b, 0.5]:
    for days in [10.0, 30.0, 100.0, 365.0]:
        t = days * 86400.0
        print(f"1,{r!r},{t!r},{float(q / (4 * math.pi * k) * exp1(r * r / (4 * alpha * t)))!r}")
