#!/usr/bin/python3
"""Reference values for test/unit/measure/handdrawn.test.ts, computed with scikit-image's regionprops
(and scipy's ConvexHull for the hull of the pixel squares) on the same hand-drawn rasters the test draws.

Run with Debian's Python and packages (apt-get install python3-skimage):

    /usr/bin/python3 scripts/reference/handdrawn_regionprops.py

It prints one block per raster; the test carries the printed values as literals.

Conversions to the project's conventions (src/core/measure/registry.ts), done here and nowhere else:
- Coordinates: regionprops gives the centroid in pixel indices (row, col), a pixel's centre at its index;
  the project puts pixel (0, 0) on [0, 1)², so x = col + 0.5, y = row + 0.5.
- Axes: regionprops' inertia tensor holds the variances of the pixel centres. The project's second
  moments add each pixel's own extent, 1/12 px² along x and along y (the variance of a uniform unit
  interval), so the axes here are 4·√(λ + 1/12) with λ an eigenvalue of regionprops' inertia tensor;
  axis_major_length itself (4·√λ) is printed beside them for comparison.
- Orientation: regionprops' `orientation` φ is the angle from the row axis (pointing down the image) to
  the major axis, in [−π/2, π/2]. The project's θ is counter-clockwise on screen from +x, in (−90°, 90°]:
  θ = φ·180/π − 90°, plus 180° when that is −90° or less. (Both are ½·atan2 of the same second moments:
  φ = ½·atan2(2μ₁₁, μ₀₂ − μ₂₀) and θ = −½·atan2(2μ₁₁, μ₂₀ − μ₀₂); mirroring the second argument of atan2
  turns one into the other up to a quarter turn.)
  regionprops 0.19.3 special-cases equal variances along the rows and the columns (μ₂₀ = μ₀₂) and then
  returns ±π/4 with the opposite sign to its own general formula; the shapes symmetric about a diagonal
  (the two bars, the L shape) are such cases, so their orientation is marked "tie" below and is not used
  as a reference (their ±45° follows from the symmetry and is checked as derived in the test).
- Perimeter: regionprops' perimeter_crofton (4 directions) is printed as it is; the test compares the
  project's outline with it within a stated tolerance.
- Solidity: regionprops' solidity counts the pixels of a rasterised hull, while the project divides by the
  area of the convex hull of the pixel squares; that hull is computed here with scipy.spatial.ConvexHull
  over the corners of the cell's pixels.
"""
import json

import numpy as np
import scipy
import skimage
from scipy.spatial import ConvexHull
from skimage.measure import regionprops


def raster(w, h, f):
    """Label image of h rows and w columns, label f(x, y) at column x, row y (as the test's raster())."""
    img = np.zeros((h, w), dtype=np.int32)
    for y in range(h):
        for x in range(w):
            img[y, x] = f(x, y)
    return img


def hull_area_of_pixel_squares(coords):
    corners = np.concatenate([coords + np.array(d) for d in ((0, 0), (0, 1), (1, 0), (1, 1))])
    return ConvexHull(corners).volume  # in 2-D, .volume is the area


def values(img, label=1):
    p = next(r for r in regionprops(img) if r.label == label)
    row, col = p.centroid
    ev = np.linalg.eigvalsh(p.inertia_tensor)[::-1]  # descending
    major = 4 * np.sqrt(ev[0] + 1 / 12)
    minor = 4 * np.sqrt(ev[1] + 1 / 12)
    theta = np.degrees(p.orientation) - 90
    if theta <= -90:
        theta += 180
    hull = hull_area_of_pixel_squares(p.coords.astype(float))
    return {
        'area': int(p.area),
        'x': col + 0.5,
        'y': row + 0.5,
        'major_axis': major,
        'minor_axis': minor,
        'skimage_axis_major_length': p.axis_major_length,
        'skimage_axis_minor_length': p.axis_minor_length,
        'orientation_deg': theta,
        'skimage_orientation_rad': p.orientation,
        'orientation_tie': bool(p.inertia_tensor[0, 0] == p.inertia_tensor[1, 1]),
        'elongation': major / minor,
        'eq_diameter': p.equivalent_diameter_area,
        'perimeter_crofton': p.perimeter_crofton,
        'hull_area_of_pixel_squares': hull,
        'solidity': p.area / hull,
    }


def L_shape(x, y):
    u, v = x - 2, y - 2
    return 1 if (0 <= u < 10 and 0 <= v < 30) or (10 <= u < 30 and 20 <= v < 30) else 0


def oblique_ellipse(x, y):
    # Semi-axes 25 and 10 px, major axis 30° counter-clockwise from +x on screen (y down, hence −(y − cy)),
    # centred off the pixel grid's symmetry points so that no symmetry of the raster ties the moments.
    cx, cy, t = 44.3, 39.7, np.radians(30)
    u, v = x + 0.5 - cx, -(y + 0.5 - cy)
    a = u * np.cos(t) + v * np.sin(t)
    b = -u * np.sin(t) + v * np.cos(t)
    return 1 if (a / 25) ** 2 + (b / 10) ** 2 <= 1 else 0


RASTERS = {
    'rectangle 20 x 10': raster(40, 30, lambda x, y: 1 if 5 <= x < 25 and 7 <= y < 17 else 0),
    'rectangle upright': raster(30, 40, lambda x, y: 1 if 7 <= x < 17 and 5 <= y < 25 else 0),
    'diagonal bar down': raster(40, 40, lambda x, y: 1 if abs(x - y) <= 1 and 6 <= x + y <= 72 else 0),
    'diagonal bar up': raster(40, 40, lambda x, y: 1 if abs(x - (39 - y)) <= 1 and 6 <= x + (39 - y) <= 72 else 0),
    'disc r 30': raster(80, 80, lambda x, y: 1 if (x + 0.5 - 40) ** 2 + (y + 0.5 - 40) ** 2 <= 30 * 30 else 0),
    'L shape': raster(40, 40, L_shape),
    'oblique ellipse': raster(90, 80, oblique_ellipse),
}

if __name__ == '__main__':
    print(f'scikit-image {skimage.__version__}, scipy {scipy.__version__}, numpy {np.__version__}')
    for name, img in RASTERS.items():
        v = values(img)
        print(name + ': ' + json.dumps({k: (float(f'{x:.12g}') if isinstance(x, float) else x) for k, x in v.items()}))
