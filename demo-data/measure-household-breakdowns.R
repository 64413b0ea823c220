# The "measured" values of the breakdown plants of demo-data/manifest.yaml (the district, interviewer, mode and
# seasonal plants), computed from the committed household waves. R 4.2.2 (Debian r-base-core) with survey 4.1.1
# (Debian r-cran-survey). Run from the repository root:
#
#   Rscript demo-data/measure-household-breakdowns.R
#
# Conventions, as in the monitor: a change is the later wave minus the earlier one; the household survey has no
# weights or design, so a domain's estimate comes from the unweighted design svydesign(ids = ~1) over the whole wave
# (svyby: domain estimation, never a subset design), the two waves are independent samples, V(change) = V(after) +
# V(before); the heterogeneity test is the Wald test of the domain-by-wave interaction of svyglm on the two waves
# stacked with the wave as stratum (regTermTest, method = "Wald", df = Inf); per-domain changes get Wald z tests and
# Benjamini-Hochberg within the breakdown; a domain's contribution is its mean share of the two waves times its
# change (Kitagawa 1955), and the composition term is the rest of the overall change.

suppressMessages(library(survey))
# The household survey has no weights: svydesign's "assuming equal probability" is what is meant.
svydesign <- function(...) suppressWarnings(survey::svydesign(...))

folder <- file.path("demo-data", "waves")
waves <- c("2024-Q1", "2024-Q2", "2024-Q3", "2024-Q4", "2025-Q1", "2025-Q2", "2025-Q3")
read_wave <- function(w) {
  read.csv(file.path(folder, paste0(w, ".csv")), colClasses = "character", na.strings = character(0))
}
data <- lapply(waves, read_wave)
names(data) <- waves

say <- function(...) cat(sprintf(...), "\n", sep = "")

# One breakdown of the change in y (a numeric column, NA = not a valid answer) between two waves by a domain column.
breakdown <- function(before, after, y, by, label) {
  b <- data[[before]]; a <- data[[after]]
  b$y <- y(b); a$y <- y(a)
  b <- b[!is.na(b$y), ]; a <- a[!is.na(a$y), ]
  db <- svydesign(ids = ~1, data = b); da <- svydesign(ids = ~1, data = a)
  f <- as.formula(paste0("~", by))
  eb <- svyby(~y, f, db, svymean); ea <- svyby(~y, f, da, svymean)
  domains <- intersect(eb[[by]], ea[[by]])
  eb <- eb[match(domains, eb[[by]]), ]; ea <- ea[match(domains, ea[[by]]), ]
  change <- ea$y - eb$y
  se <- sqrt(ea$se^2 + eb$se^2)
  z <- change / se
  p <- 2 * pnorm(-abs(z))
  q <- p.adjust(p, "BH")
  share <- (table(b[[by]])[domains] / nrow(b) + table(a[[by]])[domains] / nrow(a)) / 2
  contribution <- as.numeric(share) * change
  overall <- mean(a$y) - mean(b$y)
  both <- rbind(transform(b, wave = before), transform(a, wave = after))
  both$domain <- factor(both[[by]]); both$wave <- factor(both$wave, levels = c(before, after))
  stacked <- svydesign(ids = ~1, strata = ~wave, data = both)
  # A rate that is 0 in every domain but one has a singular covariance matrix: no Wald test then.
  het <- tryCatch(regTermTest(svyglm(y ~ domain * wave, design = stacked), ~domain:wave, method = "Wald", df = Inf),
                  error = function(e) list(chisq = NA, df = NA, p = NA))
  say("%s, %s -> %s, by %s (survey 4.1.1 svyby/svymean, ids = ~1)", label, before, after, by)
  say("  overall %.6f -> %.6f, change %.6f; within-domain part %.6f, composition %.6f",
      mean(b$y), mean(a$y), overall, sum(contribution), overall - sum(contribution))
  say("  heterogeneity: regTermTest Wald chisq %.4f on %d df, p %.4g", het$chisq, het$df, het$p)
  ord <- order(-abs(contribution))
  for (k in ord) {
    say("  %-10s n %5d -> %5d  %.6f (se %.6f) -> %.6f (se %.6f)  change %+.6f se %.6f z %+.3f p %.4g q %.4g contribution %+.6f",
        domains[k], sum(b[[by]] == domains[k]), sum(a[[by]] == domains[k]), eb$y[k], eb$se[k], ea$y[k], ea$se[k],
        change[k], se[k], z[k], p[k], q[k], contribution[k])
  }
}

yes <- function(column) function(d) as.numeric(d[[column]] == "yes")
number <- function(column) function(d) as.numeric(d[[column]])

# ---- the district plant: low water pressure in Kestle Point ----------------------------------------------------
for (w in waves) {
  d <- data[[w]]
  say("water_pressure_low %s: %d of %d (%.4f); KES %d of %d; elsewhere %d of %d", w, sum(d$water_pressure_low == "yes"),
      nrow(d), mean(d$water_pressure_low == "yes"), sum(d$water_pressure_low == "yes" & d$district == "KES"),
      sum(d$district == "KES"), sum(d$water_pressure_low == "yes" & d$district != "KES"), sum(d$district != "KES"))
}
pw <- function(before, after) {
  b <- data[[before]]$water_pressure_low == "yes"; a <- data[[after]]$water_pressure_low == "yes"
  t <- prop.test(c(sum(a), sum(b)), c(length(a), length(b)), correct = FALSE)
  h <- 2 * asin(sqrt(mean(a))) - 2 * asin(sqrt(mean(b)))
  say("water_pressure_low %s -> %s: %.4f -> %.4f, %+.2f points (95%% CI %+.2f, %+.2f), h %.4f, prop.test p %.3g",
      before, after, mean(b), mean(a), 100 * (mean(a) - mean(b)), 100 * t$conf.int[1], 100 * t$conf.int[2], h,
      t$p.value)
}
for (k in 2:7) pw(waves[k - 1], waves[k])
for (k in 5:7) pw(waves[k - 4], waves[k])
breakdown("2025-Q1", "2025-Q2", yes("water_pressure_low"), "district", "water_pressure_low share")
for (w in waves) data[[w]]$kes <- ifelse(data[[w]]$district == "KES", "KES", "elsewhere")
breakdown("2025-Q1", "2025-Q2", yes("water_pressure_low"), "kes", "water_pressure_low share, KES against the rest")

# ---- the interviewer plant: H17 keys 999 for every height not measured ------------------------------------------
for (w in waves) {
  d <- data[[w]]
  load <- table(d$interviewer_id)
  s <- d$height_cm == "999"
  say("%s: %d interviewers, workloads %d..%d (median %.1f); H17 %d interviews, %d with 999 (%.4f); others' 999s %d",
      w, length(load), min(load), max(load), median(load), sum(d$interviewer_id == "H17"),
      sum(s & d$interviewer_id == "H17"), mean(s[d$interviewer_id == "H17"]), sum(s & d$interviewer_id != "H17"))
  if (any(s)) {
    ids <- sort(d$respondent_id[s])
    say("  case list %s (height_cm = 999): %d keys, first %s, last %s", w, length(ids), ids[1], ids[length(ids)])
    cat(strwrap(paste(ids, collapse = ", "), width = 110, prefix = "    "), sep = "\n")
    breakdown(waves[match(w, waves) - 1], w, function(x) as.numeric(x$height_cm == "999"), "interviewer_id",
              "height_cm 999 rate (unweighted)")
  }
}

# ---- the mode plant: neighbourhood safety rated higher on the telephone -----------------------------------------
for (w in waves) {
  d <- data[[w]]
  m <- tapply(as.numeric(d$neighbourhood_safe), d$interview_mode, mean)
  say("neighbourhood_safe %s: mean %.4f; web %.4f telephone %.4f in_person %.4f", w,
      mean(as.numeric(d$neighbourhood_safe)), m["web"], m["telephone"], m["in_person"])
}
cliff <- function(x, y) {
  w <- wilcox.test(x, y, exact = FALSE, correct = FALSE)
  c(delta = 2 * w$statistic / (length(x) * length(y)) - 1, p = w$p.value)
}
for (k in 2:7) {
  x <- as.numeric(data[[waves[k]]]$neighbourhood_safe); y <- as.numeric(data[[waves[k - 1]]]$neighbourhood_safe)
  r <- cliff(x, y)
  say("neighbourhood_safe %s -> %s: Cliff's delta %.4f (wilcox.test p %.3g)", waves[k - 1], waves[k], r[1], r[2])
}
breakdown("2024-Q4", "2025-Q1", number("neighbourhood_safe"), "interview_mode", "neighbourhood_safe mean")

# ---- the seasonal plant: hours of heating --------------------------------------------------------------------
hedges <- function(x, y) {
  n1 <- length(x); n2 <- length(y)
  sp <- sqrt(((n1 - 1) * var(x) + (n2 - 1) * var(y)) / (n1 + n2 - 2))
  g <- (1 - 3 / (4 * (n1 + n2) - 9)) * (mean(x) - mean(y)) / sp
  half <- 1.96 * sqrt((n1 + n2) / (n1 * n2) + g^2 / (2 * (n1 + n2)))
  c(g = g, low = g - half, high = g + half, p = t.test(x, y)$p.value)
}
hh <- function(before, after, against) {
  x <- as.numeric(data[[after]]$heating_hours); y <- as.numeric(data[[before]]$heating_hours)
  r <- hedges(x, y)
  d <- cliff(x, y)
  say("heating_hours %s against %s (%s): mean %.2f -> %.2f, g %.4f (%.4f, %.4f), Welch p %.3g; Cliff's delta %.4f, wilcox.test p %.3g",
      after, before, against, mean(y), mean(x), r[1], r[2], r[3], r[4], d[1], d[2])
}
for (k in 2:7) hh(waves[k - 1], waves[k], "previous")
for (k in 5:7) hh(waves[k - 4], waves[k], "sameWaveBack 4")

# ---- every variable against the same quarter a year back (compareWith: [previous, {sameWaveBack: 4}]) -----------
# The second baseline compares 2025-Q1..Q3 with 2024-Q1..Q3, so every plant that began between the two waves shows
# again there. The main test of each kind, as in README.md; sentinels and declared codes left out.
valid <- function(d, v) {
  x <- d[[v]]
  bad <- x == "" | (v == "height_cm" & x == "999") | (v == "income_monthly" & x == "-9") |
    (v == "children" & x == "77") | (v == "move_in_date" & x == "1900-01-01")
  x[!bad]
}
continuous <- c("age", "height_cm", "income_monthly", "commute_minutes", "children", "mooring_fee", "heating_hours")
ordinal <- c("housing_satisfaction", "life_satisfaction", "neighbourhood_safe")
categorical <- c("interview_mode", "district", "heating_fuel", "tenure")
binary <- c("has_broadband", "owns_boat", "water_pressure_low")
for (k in 5:7) {
  before <- waves[k - 4]; after <- waves[k]
  b <- data[[before]]; a <- data[[after]]
  say("%s against %s (the same quarter a year back):", after, before)
  for (v in continuous) {
    r <- hedges(as.numeric(valid(a, v)), as.numeric(valid(b, v)))
    say("  %-22s g %+.4f (%+.4f, %+.4f), Welch p %.3g", v, r[1], r[2], r[3], r[4])
  }
  r <- hedges(as.numeric(as.Date(valid(a, "move_in_date"))), as.numeric(as.Date(valid(b, "move_in_date"))))
  say("  %-22s g %+.4f (%+.4f, %+.4f), Welch p %.3g", "move_in_date", r[1], r[2], r[3], r[4])
  for (v in ordinal) {
    r <- cliff(as.numeric(valid(a, v)), as.numeric(valid(b, v)))
    say("  %-22s Cliff's delta %+.4f, wilcox.test p %.3g", v, r[1], r[2])
  }
  for (v in categorical) {
    t <- table(c(rep("b", nrow(b)), rep("a", nrow(a))), c(b[[v]], a[[v]]))
    x <- suppressWarnings(chisq.test(t, correct = FALSE))
    say("  %-22s Cramer's V %.4f, chisq.test p %.3g", v, sqrt(x$statistic / sum(t)), x$p.value)
  }
  for (v in binary) {
    success <- if (v == "owns_boat") "1" else "yes"
    pa <- mean(a[[v]] == success); pb <- mean(b[[v]] == success)
    t <- prop.test(c(sum(a[[v]] == success), sum(b[[v]] == success)), c(nrow(a), nrow(b)), correct = FALSE)
    say("  %-22s %.4f -> %.4f, %+.2f points (%+.2f, %+.2f), h %+.4f, prop.test p %.3g", v, pb, pa, 100 * (pa - pb),
        100 * t$conf.int[1], 100 * t$conf.int[2], 2 * asin(sqrt(pa)) - 2 * asin(sqrt(pb)), t$p.value)
  }
  ma <- mean(is.na(a$occupation) | trimws(a$occupation) == ""); mb <- mean(trimws(b$occupation) == "")
  say("  %-22s blank or NULL share %.4f -> %.4f", "occupation", mb, ma)
}
