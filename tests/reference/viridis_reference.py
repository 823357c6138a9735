"""Reference data for burrow's field-plot colour map (run offline; `cargo test` does not need Python).

The map is 'viridis' (S. van der Walt and N. Smith, 2015, the default colour map of matplotlib
2.0; perceptually uniform sequential map with monotonically increasing lightness). matplotlib's
own 256-entry table is taken as the published definition.

Writes:
  viridis_stops.csv    16 equally spaced stops (t = k/15), sRGB bytes, used as the table in
                       src/report/plot.rs
  viridis_samples.csv  101 equally spaced samples (t = k/100) of the full 256-entry table,
                       against which the Rust interpolation between the 16 stops is checked
Usage: python3 viridis_reference.py   (matplotlib 3.11.2 was used)
"""
import matplotlib
from matplotlib import colormaps

cmap = colormaps["viridis"]


def byte(c):
    return tuple(int(round(255 * v)) for v in c[:3])


with open("viridis_stops.csv", "w") as f:
    f.write(f"# viridis, matplotlib {matplotlib.__version__}: t,r,g,b at t = k/15\n")
    for k in range(16):
        t = k / 15
        r, g, b = byte(cmap(t))
        f.write(f"{t:.6f},{r},{g},{b}\n")

with open("viridis_samples.csv", "w") as f:
    f.write(f"# viridis, matplotlib {matplotlib.__version__}: t,r,g,b at t = k/100\n")
    for k in range(101):
        t = k / 100
        r, g, b = byte(cmap(t))
        f.write(f"{t:.6f},{r},{g},{b}\n")
