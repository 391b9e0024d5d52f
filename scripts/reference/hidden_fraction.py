#!/usr/bin/python3
"""Reference value for test/unit/reference/montecarlo.test.ts ("the minimum cell area ... raises the seeds").

The normalised area of a Poisson–Voronoi cell is close to a gamma distribution of shape and rate 7/2
(Ferenc & Néda 2007; pub, read in text). A minimum cell area a_min at seed density λ hides the fraction
F = P(Y < a_min·λ) of the cells, and keeping the visible density takes cells / (1 − F) seeds.

Run with Debian's Python and packages (apt-get install python3-scipy):

    /usr/bin/python3 scripts/reference/hidden_fraction.py
"""
import scipy
from scipy.stats import gamma

cells, width, height, min_area = 500, 500, 500, 150
density = cells / (width * height)
F = gamma.cdf(min_area * density, a=3.5, scale=1 / 3.5)
print(f'scipy {scipy.__version__}')
print(f'cells {cells} in {width} x {height} px, minimum area {min_area} px²: hidden fraction F = {F:.12g}, '
      f'seeds = cells / (1 − F) = {cells / (1 - F):.12g}, rounded {round(cells / (1 - F))}')
