# Reference values of PairedProportionsTest. Newcombe's (1998, Statistics in Medicine 17, 2635-2650, method 10)
# interval of the paired risk difference D = pC - pB, built from the Wilson limits R's prop.test gives
# (correct = FALSE), and the paired Cohen's h with that interval mapped onto its scale: with the mean share
# m = (pB + pC) / 2 held at its estimate, h(D) = g(m + D / 2 + s) - g(m - D / 2 + s), g(p) = 2 asin(sqrt(p)),
# where s is the least shift that keeps both shares in [0, 1] (so their difference stays D); h(D) is increasing
# in D and 0 at D = 0.
# Each row is a paired 2 x 2 table a (yes, yes), b (yes, no), c (no, yes), d (no, no), then the level, h and its
# limits, D and its limits. R 4.2.2 (Debian r-base-core).
# Run: Rscript paired-cohens-h.R
options(digits = 17)
g <- function(p) 2 * asin(sqrt(p))
wilson <- function(x, n, level) {
  ci <- prop.test(x, n, correct = FALSE, conf.level = level)$conf.int
  # prop.test clamps to [0, 1]; at x = 0 or n the limit is exactly 0 or 1
  c(if (x == 0) 0 else ci[1], if (x == n) 1 else ci[2])
}
paired <- function(a, b, c, d, level = 0.95) {
  n <- a + b + c + d
  pb <- (a + b) / n; pc <- (a + c) / n
  wb <- wilson(a + b, n, level); wc <- wilson(a + c, n, level)
  m <- (a + b) * (c + d) * (a + c) * (b + d)
  A <- a * d - b * c
  psi <- if (m == 0) 0 else if (A > n / 2) (A - n / 2) / sqrt(m) else if (A >= 0) 0 else A / sqrt(m)
  D <- pc - pb
  dl <- pc - wc[1]; du <- wb[2] - pb
  el <- wc[2] - pc; eu <- pb - wb[1]
  lim <- c(max(-1, D - sqrt(dl^2 - 2 * psi * dl * du + du^2)), min(1, D + sqrt(el^2 - 2 * psi * el * eu + eu^2)))
  mean <- (pb + pc) / 2
  hAt <- function(x) {
    lo <- min(mean + x / 2, mean - x / 2); hi <- max(mean + x / 2, mean - x / 2)
    s <- if (lo < 0) -lo else if (hi > 1) 1 - hi else 0
    g(mean + x / 2 + s) - g(mean - x / 2 + s)
  }
  c(g(pc) - g(pb), hAt(lim[1]), hAt(lim[2]), D, lim)
}
cases <- rbind(c(794, 150, 86, 570), c(1, 1, 7, 12), c(59, 6, 16, 80), c(0, 4, 0, 27), c(12, 0, 0, 19),
               c(0, 0, 0, 30), c(3, 9, 1, 2), c(20, 20, 30, 30), c(0, 1, 6, 3), c(0, 0, 5, 0))
for (level in c(0.95, 0.9)) {
  for (i in seq_len(nrow(cases))) {
    r <- paired(cases[i, 1], cases[i, 2], cases[i, 3], cases[i, 4], level)
    cat(sprintf("\"%d, %d, %d, %d, %g, %.17g, %.17g, %.17g, %.17g, %.17g, %.17g\",\n", cases[i, 1], cases[i, 2],
                cases[i, 3], cases[i, 4], level, r[1], r[2], r[3], r[4], r[5], r[6]))
  }
}
