#!/usr/bin/Rscript
# Reference values for test/unit/mask/lfunction.test.ts: the L-function with the translation edge correction
# of a point pattern in an irregular mask window, computed with R's spatstat (Debian: apt-get install
# r-cran-spatstat). Run from the repository's root:
#
#     Rscript scripts/reference/mask_spatstat.R > test/unit/mask/spatstat-mask.json
#
# The mask is a 120 x 90 px raster: a wavy disc with a rectangular hole, cut by the raster's right border.
# Pixel (x, y) of the project's rasters (row y, column x, the pixel spanning [x, x + 1) x [y, y + 1)) is
# pixel [y + 1, x + 1] of spatstat's mask matrix, whose centre is (x + 0.5, y + 0.5): the same coordinates
# in both, so no conversion is needed (spatstat's y axis points up and the project's down; the L-function
# does not change under that reflection, and the points are given in the same numbers to both).
# The points are drawn by spatstat (uniform in the window, set.seed(20240611)) and written with the values.
suppressMessages(library(spatstat))
W <- 120; H <- 90
M <- matrix(FALSE, nrow = H, ncol = W)
for (y in 0:(H - 1)) for (x in 0:(W - 1)) {
  px <- x + 0.5; py <- y + 0.5
  t <- atan2(py - 45, px - 70)
  r <- 42 * (1 + 0.2 * sin(3 * t))
  inside <- sqrt((px - 70)^2 + (py - 45)^2) < r
  hole <- px > 60 && px < 75 && py > 35 && py < 48
  M[y + 1, x + 1] <- inside && !hole
}
win <- owin(mask = M, xrange = c(0, W), yrange = c(0, H))
set.seed(20240611)
X <- runifpoint(160, win = win)
r <- seq(0, 20, by = 0.8)
L <- Lest(X, correction = "translate", r = r)
rows <- apply(M, 1, function(v) paste0(ifelse(v, "1", "0"), collapse = ""))
num <- function(v) paste0(formatC(v, digits = 15, format = "g"), collapse = ", ")
cat("{\n")
cat(sprintf('  "source": "R %s, spatstat %s (spatstat.explore %s): Lest(X, correction = \\"translate\\")",\n',
            paste(R.version$major, R.version$minor, sep = "."), packageVersion("spatstat"), packageVersion("spatstat.explore")))
cat(sprintf('  "width": %d,\n  "height": %d,\n', W, H))
cat('  "mask": [\n', paste0('    "', rows, '"', collapse = ",\n"), '\n  ],\n', sep = "")
cat(sprintf('  "areaPx2": %s,\n', num(area(win))))
cat(sprintf('  "x": [%s],\n', num(X$x)))
cat(sprintf('  "y": [%s],\n', num(X$y)))
cat(sprintf('  "r": [%s],\n', num(L$r)))
cat(sprintf('  "Ltrans": [%s]\n', num(L$trans)))
cat("}\n")
