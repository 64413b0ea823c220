# The "measured" values of demo-data/panel-manifest.yaml and of the panel section of demo-data/README.md, computed
# from the committed files of the Harrowmere Household Panel. R 4.2.2 (Debian r-base-core) with survey 4.1.1 (Debian
# r-cran-survey). Run from the repository root:
#
#   Rscript demo-data/measure-panel.R
#
# Conventions, as in the monitor: every effect is the later wave relative to the earlier one; each wave is read at
# its latest release, except where the two releases of 2025-Q2 are compared; the design is
# svydesign(ids = ~village, strata = ~district, weights = ~weight, nest = TRUE) with lonely PSUs "adjust", the
# weights-only design svydesign(ids = ~1, weights = ~weight); a two-wave design-based t has the sum over the waves of
# their design degrees of freedom (#PSU - #strata with answers, or n - 1 for the weights-only design); paired
# comparisons are unweighted and use the households in both waves with both answers.

suppressMessages(library(survey))
options(survey.lonely.psu = "adjust")

folder <- file.path("demo-data", "panel")
waves <- c("2024-Q4", "2025-Q1", "2025-Q2", "2025-Q3")
read_wave <- function(w) {
  read.csv(file.path(folder, paste0(w, ".csv")), colClasses = "character", na.strings = "")
}
files <- lapply(waves, read_wave)
names(files) <- waves
latest <- lapply(files, function(d) d[d$revision == max(d$revision), ])
numeric_columns <- c("weight", "household_size", "rooms", "hours_worked", "income_monthly", "energy_bill",
                     "life_satisfaction", "fuel_support")
for (w in waves) for (v in numeric_columns) latest[[w]][[v]] <- as.numeric(latest[[w]][[v]])

say <- function(...) cat(sprintf(...), "\n", sep = "")
f4 <- function(x) formatC(x, digits = 4, format = "g")

# ---- shape -------------------------------------------------------------------------------------------------
say("== shape")
for (w in waves) {
  d <- files[[w]]
  say("%s: rows per release %s; households %d in %d villages; design df %d",
      w, paste(table(d$revision), collapse = " / "), nrow(latest[[w]]), length(unique(latest[[w]]$village)),
      length(unique(latest[[w]]$village)) - length(unique(latest[[w]]$district)))
}
ids <- lapply(latest, function(d) d$household_id)
seen <- table(unlist(ids))
say("households ever interviewed %d; in one wave only %d; in all four %d", length(seen), sum(seen == 1),
    sum(seen == 4))
for (i in 2:4) say("%s -> %s: in both %d, only the earlier %d, only the later %d", waves[i - 1], waves[i],
                   length(intersect(ids[[i - 1]], ids[[i]])), length(setdiff(ids[[i - 1]], ids[[i]])),
                   length(setdiff(ids[[i]], ids[[i - 1]])))
print(table(latest[["2024-Q4"]]$district[!duplicated(latest[["2024-Q4"]]$village)]))

# ---- design-based two-wave comparisons -----------------------------------------------------------------------
designs <- function(d, clustered) {
  if (clustered) svydesign(ids = ~village, strata = ~district, weights = ~weight, data = d, nest = TRUE)
  else svydesign(ids = ~1, weights = ~weight, data = d)
}
indicator <- function(d, v, success) { d$y <- as.numeric(d[[v]] == success); d }
numeric_y <- function(d, v) { d$y <- d[[v]]; d[!is.na(d$y), ] }

# Difference of weighted means or shares, its SE, t, df and p under one design, and Cohen's d or h.
two_wave <- function(b, c, clustered, share) {
  db <- designs(b, clustered); dc <- designs(c, clustered)
  mb <- svymean(~y, db); mc <- svymean(~y, dc)
  diff <- unname(coef(mc) - coef(mb)); se <- sqrt(as.numeric(SE(mb))^2 + as.numeric(SE(mc))^2)
  df <- degf(db) + degf(dc)
  t <- diff / se; p <- 2 * pt(-abs(t), df)
  out <- list(before = unname(coef(mb)), after = unname(coef(mc)), diff = diff, se = se, t = t, df = df, p = p,
              deff_before = unname(deff(svymean(~y, db, deff = TRUE))),
              deff_after = unname(deff(svymean(~y, dc, deff = TRUE))))
  if (share) {
    pb <- out$before; pc <- out$after
    h <- 2 * asin(sqrt(pc)) - 2 * asin(sqrt(pb))
    se_h <- sqrt(as.numeric(SE(mb))^2 / (pb * (1 - pb)) + as.numeric(SE(mc))^2 / (pc * (1 - pc)))
    out$effect <- h; out$ci <- h + c(-1, 1) * qnorm(0.975) * se_h
  } else {
    sd_w <- function(x) { m <- weighted.mean(x$y, x$weight); sqrt(sum(x$weight * (x$y - m)^2) / sum(x$weight)) }
    s <- sqrt((sd_w(b)^2 + sd_w(c)^2) / 2)
    out$effect <- diff / s; out$ci <- (diff + c(-1, 1) * qt(0.975, df) * se) / s
  }
  out
}
show_two_wave <- function(label, r) {
  say("%s: %s -> %s, diff %s (SE %s), t %s on %d df, p %s; effect %s (95%% CI %s to %s); deff %s / %s", label,
      f4(r$before), f4(r$after), f4(r$diff), f4(r$se), f4(r$t), r$df, f4(r$p), f4(r$effect), f4(r$ci[1]),
      f4(r$ci[2]), f4(r$deff_before), f4(r$deff_after))
}
kish <- function(w) sum(w)^2 / sum(w^2)

# Rao-Scott on the stacked design (strata wave x district), and Cramer's V of the weighted shares at Kish sizes.
categorical <- function(b, c, v) {
  st <- rbind(b, c); st$wavestratum <- paste(st$wave, st$district); st$y <- factor(st[[v]])
  des <- svydesign(ids = ~village, strata = ~wavestratum, weights = ~weight, data = st, nest = TRUE)
  f <- svychisq(~y + wave, des, statistic = "F")
  lv <- levels(st$y)
  sh <- function(d) sapply(lv, function(l) sum(d$weight[d[[v]] == l]) / sum(d$weight))
  nb <- kish(b$weight); nc <- kish(c$weight)
  tab <- rbind(sh(b) * nb, sh(c) * nc)
  expected <- outer(rowSums(tab), colSums(tab)) / sum(tab)
  x2 <- sum((tab - expected)^2 / expected)
  list(F = unname(f$statistic), p = unname(f$p.value), V = sqrt(x2 / (nb + nc)), before = sh(b), after = sh(c))
}
show_categorical <- function(label, r) {
  say("%s: Rao-Scott F %s, p %s; Cramer's V (weighted, Kish effective sizes) %s", label, f4(r$F), f4(r$p), f4(r$V))
  print(round(rbind(before = r$before, after = r$after), 4))
}

# ---- paired comparisons --------------------------------------------------------------------------------------
pairs_of <- function(b, c, v) {
  m <- merge(b[, c("household_id", v)], c[, c("household_id", v)], by = "household_id", suffixes = c(".b", ".c"))
  m[!is.na(m[[2]]) & !is.na(m[[3]]), ]
}
rank_biserial <- function(d) { d <- d[d != 0]; r <- rank(abs(d)); (sum(r[d > 0]) - sum(r[d < 0])) / sum(r) }
paired_numeric <- function(b, c, v) {
  m <- pairs_of(b, c, v); d <- m[[3]] - m[[2]]
  sw <- shapiro.test(if (length(d) > 5000) d[1:5000] else d)$p.value
  say("%s paired: %d pairs (%d with a change), mean difference %s, Cohen's d_z %s; Shapiro-Wilk on the differences p %s;",
      v, nrow(m), sum(d != 0), f4(mean(d)), f4(mean(d) / sd(d)), f4(sw))
  say("    signed rank: rank-biserial r %s, p %s (wilcox.test paired, normal approximation)", f4(rank_biserial(d)),
      f4(wilcox.test(m[[3]], m[[2]], paired = TRUE, exact = FALSE, correct = FALSE)$p.value))
}
# Cohen's h of paired shares with Newcombe's (1998, method 10) interval of the difference carried onto the h scale at
# the observed mean share (shifted as little as keeps both shares in [0, 1]), as test/resources/proportion/
# paired-cohens-h.R in the monitor's tests
paired_h <- function(a, b, c, d, level = 0.95) {
  g <- function(p) 2 * asin(sqrt(p))
  wilson <- function(x, n) {
    ci <- prop.test(x, n, correct = FALSE, conf.level = level)$conf.int
    c(if (x == 0) 0 else ci[1], if (x == n) 1 else ci[2])
  }
  a <- as.numeric(a); b <- as.numeric(b); c <- as.numeric(c); d <- as.numeric(d) # counts past 2^31 in m
  n <- a + b + c + d; pb <- (a + b) / n; pc <- (a + c) / n
  wb <- wilson(a + b, n); wc <- wilson(a + c, n)
  m <- (a + b) * (c + d) * (a + c) * (b + d); A <- a * d - b * c
  psi <- if (m == 0) 0 else if (A > n / 2) (A - n / 2) / sqrt(m) else if (A >= 0) 0 else A / sqrt(m)
  D <- pc - pb; dl <- pc - wc[1]; du <- wb[2] - pb; el <- wc[2] - pc; eu <- pb - wb[1]
  lim <- c(max(-1, D - sqrt(dl^2 - 2 * psi * dl * du + du^2)), min(1, D + sqrt(el^2 - 2 * psi * el * eu + eu^2)))
  mean <- (pb + pc) / 2
  hAt <- function(x) {
    lo <- min(mean + x / 2, mean - x / 2); hi <- max(mean + x / 2, mean - x / 2)
    s <- if (lo < 0) -lo else if (hi > 1) 1 - hi else 0
    g(mean + x / 2 + s) - g(mean - x / 2 + s)
  }
  c(g(pc) - g(pb), hAt(lim[1]), hAt(lim[2]))
}
paired_binary <- function(b, c, v, success) {
  m <- pairs_of(b, c, v); x0 <- m[[2]] == success; x1 <- m[[3]] == success
  n01 <- sum(!x0 & x1); n10 <- sum(x0 & !x1); n <- nrow(m)
  p0 <- mean(x0); p1 <- mean(x1)
  h <- suppressWarnings(paired_h(sum(x0 & x1), n10, n01, sum(!x0 & !x1)))
  say("%s paired: %d pairs; %s -> %s; %d turned '%s', %d turned away; McNemar X2 %s, p %s; Cohen's h %s (95%% CI %s to %s)",
      v, n, f4(p0), f4(p1), n01, success, n10, f4((n01 - n10)^2 / (n01 + n10)),
      f4(mcnemar.test(table(x0, x1), correct = FALSE)$p.value), f4(h[1]), f4(h[2]), f4(h[3]))
}
stuart_maxwell <- function(b, c, v) {
  m <- pairs_of(b, c, v); lv <- sort(unique(c(m[[2]], m[[3]])))
  t <- table(factor(m[[2]], lv), factor(m[[3]], lv))
  k <- length(lv); d <- (rowSums(t) - colSums(t))[-k]
  S <- -(t + t(t)); diag(S) <- rowSums(t) + colSums(t) - 2 * diag(t); S <- S[-k, -k]
  x2 <- drop(t(d) %*% solve(S) %*% d)
  off <- t; diag(off) <- 0; at <- which(off == max(off), arr.ind = TRUE)
  moved <- (colSums(t) - rowSums(t)) / sum(t)
  say("%s paired: %d pairs; Stuart-Maxwell X2 %s on %d df, p %s; largest flow %s -> %s (%d); share that moved most %s %+.4f",
      v, sum(t), f4(x2), k - 1, f4(pchisq(x2, k - 1, lower.tail = FALSE)), lv[at[1, 1]], lv[at[1, 2]], max(off),
      names(which.max(abs(moved))), moved[which.max(abs(moved))])
  print(t)
}

# ---- relationships and the benchmark -------------------------------------------------------------------------
spearman <- function(d, x, y) {
  ok <- !is.na(d[[x]]) & !is.na(d[[y]]); r <- cor(d[[x]][ok], d[[y]][ok], method = "spearman"); n <- sum(ok)
  half <- qnorm(0.975) * sqrt(1.06 / (n - 3))
  c(r = r, n = n, lo = tanh(atanh(r) - half), hi = tanh(atanh(r) + half))
}
relationship <- function(b, c, x, y) {
  a <- spearman(b, x, y); z <- spearman(c, x, y)
  diff <- z[["r"]] - a[["r"]]
  # Zou (2007), Psychological Methods 12, 399-413: the interval of a difference from the two single intervals
  lo <- diff - sqrt((z[["r"]] - z[["lo"]])^2 + (a[["hi"]] - a[["r"]])^2)
  hi <- diff + sqrt((z[["hi"]] - z[["r"]])^2 + (a[["r"]] - a[["lo"]])^2)
  zstat <- (atanh(z[["r"]]) - atanh(a[["r"]])) / sqrt(1.06 / (a[["n"]] - 3) + 1.06 / (z[["n"]] - 3))
  say("%s ~ %s: Spearman rho %s (n %d) -> %s (n %d), difference %s (95%% CI %s to %s), Fisher z %s, p %s", x, y,
      f4(a[["r"]]), a[["n"]], f4(z[["r"]]), z[["n"]], f4(diff), f4(lo), f4(hi), f4(zstat), f4(2 * pnorm(-abs(zstat))))
}
register <- c(0.30, 0.34, 0.15, 0.13, 0.06, 0.02)   # household size 1..6 in the county register
benchmark <- function(d, w) {
  # Weighted, design-based, as the monitor judges a weighted dataset: svygofchisq on the weighted totals, and
  # Cohen's w of the weighted shares with its noncentral chi-square interval on the Satterthwaite scale (X2 / scale on
  # its df, the effective size chosen so that the point estimate is w).
  d$hs <- factor(d$household_size, 1:6)
  des <- designs(d, TRUE)
  g <- svygofchisq(~hs, register, des)
  x2 <- unname(g$statistic); scale <- unname(g$parameter[["scale"]]); df <- unname(g$parameter[["df"]])
  shares <- unname(coef(svymean(~hs, des)))
  ww <- sqrt(sum((shares - register)^2 / register)); s <- x2 / scale; n <- s / ww^2
  ncp <- function(q) if (pchisq(s, df, 0) < q) 0 else uniroot(function(l) pchisq(s, df, l) - q, c(0, 10 * s + 100))$root
  say("%s household size against the register: weighted shares %s; X2 %s, scale %s, df %s, p %s; Cohen's w %s (95%% CI %s to %s)",
      w, paste(sprintf("%.4f", shares), collapse = " "), f4(x2), f4(scale), f4(df), f4(g$p.value), f4(ww),
      f4(sqrt(ncp(0.975) / n)), f4(sqrt(ncp(0.025) / n)))
}

# ---- the plants ----------------------------------------------------------------------------------------------
q4 <- latest[["2024-Q4"]]; q1 <- latest[["2025-Q1"]]; q2 <- latest[["2025-Q2"]]; q3 <- latest[["2025-Q3"]]

say("\n== 2025-Q1 against 2024-Q4")
show_two_wave("energy_bill (design)", two_wave(numeric_y(q4, "energy_bill"), numeric_y(q1, "energy_bill"), TRUE, FALSE))
paired_numeric(q4, q1, "energy_bill")
show_categorical("employment_status", categorical(q4, q1, "employment_status"))
stuart_maxwell(q4, q1, "employment_status")
wb <- indicator(q4, "water_outage", "yes"); wc <- indicator(q1, "water_outage", "yes")
show_two_wave("water_outage, weights only", two_wave(wb, wc, FALSE, TRUE))
show_two_wave("water_outage, design", two_wave(wb, wc, TRUE, TRUE))
storm <- aggregate(y ~ village, wc, mean); say("villages where most households lost water: %s",
                                               paste(storm$village[storm$y > 0.5], collapse = " "))
paired_binary(q4, q1, "water_outage", "yes")

say("\n== 2025-Q2 against 2025-Q1")
gb <- indicator(q1, "mains_gas", "yes"); gc <- indicator(q2, "mains_gas", "yes")
show_two_wave("mains_gas, weighted (design)", two_wave(gb, gc, TRUE, TRUE))
say("mains_gas unweighted: %s -> %s, Cohen's h %s, prop.test p %s", f4(mean(gb$y)), f4(mean(gc$y)),
    f4(2 * asin(sqrt(mean(gc$y))) - 2 * asin(sqrt(mean(gb$y)))),
    f4(prop.test(c(sum(gc$y), sum(gb$y)), c(nrow(gc), nrow(gb)), correct = FALSE)$p.value))
for (d in list(q1, q2)) say("%s: Gullhaven's weighted share of households %s; total weight %s; Kish deff_w %s",
                            d$wave[1], f4(sum(d$weight[d$district == "GUL"]) / sum(d$weight)), f4(sum(d$weight)),
                            f4(nrow(d) / kish(d$weight)))
paired_binary(q1, q2, "mains_gas", "yes")
show_two_wave("fuel_support (design)", two_wave(indicator(q1, "fuel_support", 1), indicator(q2, "fuel_support", 1),
                                               TRUE, TRUE))
paired_binary(q1, q2, "fuel_support", 1)
show_two_wave("water_outage, weights only", two_wave(wc, indicator(q2, "water_outage", "yes"), FALSE, TRUE))
show_two_wave("water_outage, design", two_wave(wc, indicator(q2, "water_outage", "yes"), TRUE, TRUE))
paired_binary(q1, q2, "water_outage", "yes")

say("\n== 2025-Q3 against 2025-Q2")
relationship(q2, q3, "hours_worked", "income_monthly")
relationship(q2, q3, "rooms", "energy_bill")
show_categorical("household_size", categorical(q2, q3, "household_size"))
stuart_maxwell(q2, q3, "household_size")
recruited <- setdiff(q3$household_id, q2$household_id)
say("2025-Q3 households new to the panel: %d (%s of the wave), living alone %s (the rest of the wave %s)",
    length(recruited), f4(length(recruited) / nrow(q3)), f4(mean(q3$household_size[q3$household_id %in% recruited] == 1)),
    f4(mean(q3$household_size[!q3$household_id %in% recruited] == 1)))
paired_numeric(q2, q3, "income_monthly")

say("\n== relationships that stay, every pair")
for (i in 2:4) {
  relationship(latest[[i - 1]], latest[[i]], "rooms", "energy_bill")
  if (i < 4) relationship(latest[[i - 1]], latest[[i]], "hours_worked", "income_monthly")
}

say("\n== benchmark: household size against the county register, every wave")
for (w in waves) benchmark(latest[[w]], w)

# ---- the revised release -------------------------------------------------------------------------------------
say("\n== the two releases of 2025-Q2")
r1 <- files[["2025-Q2"]][files[["2025-Q2"]]$revision == "1", ]
r2 <- files[["2025-Q2"]][files[["2025-Q2"]]$revision == "2", ]
both <- merge(r1, r2, by = "household_id", suffixes = c(".1", ".2"))
say("rows: release 1 %d, release 2 %d; in both %d, added %d, removed %d", nrow(r1), nrow(r2), nrow(both),
    length(setdiff(r2$household_id, r1$household_id)), length(setdiff(r1$household_id, r2$household_id)))
for (v in setdiff(names(r1), c("wave", "revision", "household_id", "district", "village"))) {
  a <- both[[paste0(v, ".1")]]; z <- both[[paste0(v, ".2")]]
  say("  %-18s changed cells %d of %d", v, sum(xor(is.na(a), is.na(z)) | (!is.na(a) & !is.na(z) & a != z)), nrow(both))
}
cents <- both[!is.na(both$income_monthly.1) & both$income_monthly.1 != both$income_monthly.2, ]
say("income cells changed: all in villages %s; release 1 / release 2 = %s", paste(unique(cents$village.1),
    collapse = " "), paste(unique(as.numeric(cents$income_monthly.1) / as.numeric(cents$income_monthly.2)),
                            collapse = " "))
say("release 1 incomes above 50,000 (the declared range): %d of %d (%s)",
    sum(as.numeric(r1$income_monthly) > 50000), nrow(r1), f4(mean(as.numeric(r1$income_monthly) > 50000)))

# ---- everything else: no unplanted comparison comes near significance ----------------------------------------
say("\n== unplanted comparisons: smallest p and farthest interval end, by variable (design; paired)")
planted_shift <- list(c("energy_bill", "employment_status", "water_outage"), c("mains_gas", "fuel_support", "water_outage"),
                      c("household_size"))
planted_paired <- list(c("energy_bill", "employment_status", "water_outage"), c("fuel_support", "water_outage"), c())
binaries <- list(mains_gas = "yes", water_outage = "yes", fuel_support = "1")
for (v in c("rooms", "hours_worked", "income_monthly", "energy_bill", "life_satisfaction", names(binaries))) {
  ps <- c(); far <- c(); pp <- c()
  for (i in 2:4) {
    b <- latest[[i - 1]]; c <- latest[[i]]
    if (!(v %in% planted_shift[[i - 1]])) {
      bin <- v %in% names(binaries)
      r <- if (bin) two_wave(indicator(b, v, binaries[[v]]), indicator(c, v, binaries[[v]]), TRUE, TRUE)
           else two_wave(numeric_y(b, v), numeric_y(c, v), TRUE, FALSE)
      ps <- c(ps, r$p); far <- c(far, max(abs(r$ci)))
    }
    if (!(v %in% planted_paired[[i - 1]]) && v != "rooms") {
      m <- pairs_of(b, c, v)
      pp <- c(pp, if (v %in% names(binaries)) {
        x0 <- m[[2]] == binaries[[v]]; x1 <- m[[3]] == binaries[[v]]
        if (sum(xor(x0, x1)) == 0) 1 else mcnemar.test(table(x0, x1), correct = FALSE)$p.value
      } else wilcox.test(m[[3]], m[[2]], paired = TRUE, exact = FALSE, correct = FALSE)$p.value)
    }
  }
  say("  %-18s design p >= %s, farthest CI end of d or h %s; paired p >= %s", v, f4(min(ps)), f4(max(far)),
      if (length(pp)) f4(min(pp)) else "(not compared paired: rooms never change)")
}
for (i in 2:4) for (v in c("household_size", "employment_status")) {
  if ((i == 2 && v == "employment_status") || (i == 4 && v == "household_size")) next
  say("  %s %-18s Rao-Scott p %s", waves[i], v, f4(categorical(latest[[i - 1]], latest[[i]], v)$p))
}

say("\n== design effects of the weighted means and shares (survey's deff), range over the four waves")
for (v in c("rooms", "hours_worked", "income_monthly", "energy_bill", "life_satisfaction", names(binaries))) {
  deffs <- sapply(latest, function(d) {
    d <- if (v %in% names(binaries)) indicator(d, v, binaries[[v]]) else numeric_y(d, v)
    unname(deff(svymean(~y, designs(d, TRUE), deff = TRUE)))
  })
  say("  %-18s %s", v, paste(sprintf("%.2f", deffs), collapse = " "))
}
say("Kish design effect due to weighting: %s", paste(sprintf("%.2f", sapply(latest, function(d) nrow(d) / kish(d$weight))),
                                                     collapse = " "))
