# The measured values of leisure-manifest.yaml and of the leisure survey's section of README.md, computed from the
# committed SPSS files as an independent reader sees them.
#
# R 4.2.2 (Debian r-base-core) with haven 2.5.1 (Debian r-cran-haven). From the repository root:
#   Rscript demo-data/measure-leisure.R [folder]        # folder defaults to demo-data/leisure
#
# Each file is read with haven::read_sav(user_na = TRUE), so the declared missing values arrive as values with their
# declarations; zap_missing() then turns exactly the declared ones (discrete codes and the 997-999 range) into NA.
# 99 in sport_hours is not declared anywhere: it is left out by hand here, as the monitor's detector must do.
#
# Per pair of consecutive waves (x the later wave, so a positive effect means the later wave is larger):
#   numbers and the date (in days): Welch t.test(x, y) and Hedges' g with J = 1 - 3 / (4 (n1 + n2) - 9) and 95% CI
#     g +- 1.96 sqrt((n1 + n2) / (n1 n2) + g^2 / (2 (n1 + n2))); wilcox.test(x, y, exact = FALSE, correct = FALSE)
#     and Cliff's delta = 2 AUC - 1 with its 95% CI from DeLong's placement variance
#   codes: chisq.test(table(wave, value), correct = FALSE) and Cramer's V = sqrt(X2 / n)
#   the yes/no code: prop.test(correct = FALSE) and Cohen's h with CI h +- 1.96 sqrt(1 / n1 + 1 / n2)

suppressPackageStartupMessages(library(haven))

args <- commandArgs(trailingOnly = TRUE)
folder <- if (length(args) > 0) args[1] else "demo-data/leisure"
files <- c("2024-Q3" = "2024-Q3.sav", "2024-Q4" = "2024-Q4.sav", "2025-Q1" = "2025-Q1.zsav",
           "2025-Q2" = "2025-Q2.sav")
cat("R", as.character(getRversion()), "haven", as.character(packageVersion("haven")), "\n")

raw <- lapply(files, function(f) read_sav(file.path(folder, f), user_na = TRUE))
clean <- lapply(raw, zap_missing)

cat("\n== files\n")
for (w in names(raw)) {
  d <- raw[[w]]
  cat(w, ": ", nrow(d), " cases; membership 3 is labelled '",
      names(attr(d$membership, "labels"))[attr(d$membership, "labels") == 3], "'; main_activity codes ",
      paste(sort(unique(as.numeric(d$main_activity))), collapse = " "), ", labelled ",
      paste(attr(d$main_activity, "labels"), collapse = " "), "\n", sep = "")
}

share <- function(x, v) mean(x %in% v)
cat("\n== declared and undeclared missing values, share of the wave\n")
for (w in names(raw)) {
  d <- raw[[w]]
  cat(sprintf("%s  visits -9 %.4f -8 %.4f | satisfaction 8 %.4f 9 %.4f | age 997-999 %.4f | sport 99 %.4f\n", w,
              share(d$library_visits, -9), share(d$library_visits, -8), share(d$satisfaction, 8),
              share(d$satisfaction, 9), mean(as.numeric(d$age) >= 997), share(d$sport_hours, 99)))
}
cat("comments: empty ", sprintf("%.4f", sapply(raw, function(d) mean(d$comments == ""))),
    "; longest ", max(sapply(raw, function(d) max(nchar(d$comments, type = "bytes")))), " bytes\n")

hedges <- function(x, y) {
  n1 <- length(x); n2 <- length(y)
  sp <- sqrt(((n1 - 1) * var(x) + (n2 - 1) * var(y)) / (n1 + n2 - 2))
  g <- (1 - 3 / (4 * (n1 + n2) - 9)) * (mean(x) - mean(y)) / sp
  se <- sqrt((n1 + n2) / (n1 * n2) + g^2 / (2 * (n1 + n2)))
  c(g = g, lo = g - 1.96 * se, hi = g + 1.96 * se)
}
cliff <- function(x, y) {
  m <- length(x); n <- length(y)
  r <- rank(c(x, y))
  v10 <- (r[1:m] - rank(x)) / n
  v01 <- 1 - (r[(m + 1):(m + n)] - rank(y)) / m
  auc <- mean(v10)
  se <- sqrt(var(v10) / m + var(v01) / n)
  c(delta = 2 * auc - 1, lo = 2 * (auc - 1.96 * se) - 1, hi = 2 * (auc + 1.96 * se) - 1)
}

numeric_vars <- c("library_visits", "satisfaction", "age", "sport_hours", "travel_minutes", "visit_date")
coded_vars <- c("district", "main_activity", "membership")
values <- function(d, v) {
  x <- as.numeric(d[[v]])
  x <- x[!is.na(x)]
  if (v == "sport_hours") x <- x[x != 99]
  x
}

cat("\n== comparisons (later wave against the one before)\n")
for (k in 2:length(clean)) {
  a <- clean[[k - 1]]; b <- clean[[k]]
  cat("\n--", names(clean)[k], "against", names(clean)[k - 1], "\n")
  for (v in numeric_vars) {
    x <- values(b, v); y <- values(a, v)
    g <- hedges(x, y); dl <- cliff(x, y)
    cat(sprintf("%-15s n %d / %d  mean %.3f -> %.3f  g %.3f (%.3f, %.3f) Welch p %.2g | delta %.3f (%.3f, %.3f) MW p %.2g\n",
                v, length(y), length(x), mean(y), mean(x), g["g"], g["lo"], g["hi"], t.test(x, y)$p.value,
                dl["delta"], dl["lo"], dl["hi"], wilcox.test(x, y, exact = FALSE, correct = FALSE)$p.value))
  }
  for (v in coded_vars) {
    x <- values(b, v); y <- values(a, v)
    tab <- table(c(rep("before", length(y)), rep("after", length(x))), c(y, x))
    ct <- suppressWarnings(chisq.test(tab, correct = FALSE))
    cat(sprintf("%-15s n %d / %d  X2 %.1f df %d p %.2g  V %.3f\n", v, length(y), length(x), ct$statistic,
                ct$parameter, ct$p.value, sqrt(ct$statistic / sum(tab))))
  }
  x <- values(b, "ebook_user"); y <- values(a, "ebook_user")
  h <- 2 * asin(sqrt(mean(x))) - 2 * asin(sqrt(mean(y)))
  se <- sqrt(1 / length(x) + 1 / length(y))
  cat(sprintf("%-15s share %.4f -> %.4f  h %.3f (%.3f, %.3f) p %.2g\n", "ebook_user", mean(y), mean(x), h,
              h - 1.96 * se, h + 1.96 * se,
              prop.test(c(sum(x), sum(y)), c(length(x), length(y)), correct = FALSE)$p.value))
}

cat("\n== library visits by district, mean per wave\n")
print(round(sapply(clean, function(d) tapply(values(d, "library_visits"),
                                              as.numeric(d$district)[!is.na(d$library_visits)], mean)), 2))
cat("\n== main_activity code 7 share in 2025-Q2:", sprintf("%.4f", share(raw[["2025-Q2"]]$main_activity, 7)), "\n")
