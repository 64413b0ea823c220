# Reference values of CohensHTest: Cohen's h with its MOVER interval on the arcsine scale (Zou and Donner 2008),
# built from the Wilson limits R's prop.test gives (correct = FALSE), beside Newcombe's (1998, method 10) interval
# of the risk difference from the same limits. R 4.2.2 (Debian r-base-core).
# Run: Rscript cohens-h-mover.R
options(digits = 17)
g <- function(p) 2 * asin(sqrt(p))
wilson <- function(x, n, level) {
  ci <- prop.test(x, n, correct = FALSE, conf.level = level)$conf.int
  # prop.test clamps to [0, 1]; at x = 0 or n the limit is exactly 0 or 1
  c(if (x == 0) 0 else ci[1], if (x == n) 1 else ci[2])
}
mover <- function(xb, nb, xc, nc, level = 0.95) {
  pb <- xb / nb; pc <- xc / nc
  wb <- wilson(xb, nb, level); wc <- wilson(xc, nc, level)
  h <- g(pc) - g(pb)
  d <- pc - pb
  c(h = h,
    h_low = h - sqrt((g(pc) - g(wc[1]))^2 + (g(wb[2]) - g(pb))^2),
    h_high = h + sqrt((g(wc[2]) - g(pc))^2 + (g(pb) - g(wb[1]))^2),
    d_low = d - sqrt((pc - wc[1])^2 + (wb[2] - pb)^2),
    d_high = d + sqrt((wc[2] - pc)^2 + (pb - wb[1])^2))
}
cases <- rbind(c(4, 31, 0, 30), c(0, 50, 0, 50), c(1, 200, 12, 210), c(484, 1200, 762, 1557), c(38, 50, 45, 100),
               c(3, 10, 9, 12))
for (i in seq_len(nrow(cases))) {
  r <- mover(cases[i, 1], cases[i, 2], cases[i, 3], cases[i, 4])
  cat(sprintf("%d, %d, %d, %d, %.17g, %.17g, %.17g, %.17g, %.17g\n", cases[i, 1], cases[i, 2], cases[i, 3],
              cases[i, 4], r["h"], r["h_low"], r["h_high"], r["d_low"], r["d_high"]))
}
