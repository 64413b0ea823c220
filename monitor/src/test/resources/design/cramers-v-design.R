# Reference values of WeightedDesignEffectsTest: Cramér's V of the two waves of stratified_clustered.csv (weighted
# shares, each wave scaled to its Kish effective sample size, as the monitor's estimate), with the noncentral
# chi-square interval at the effective size n / dbar of the stratified cluster design, dbar the mean generalised
# design effect of svychisq (Rao-Scott first order), and the same interval at Kish's sizes for comparison.
# R 4.2.2 (Debian r-base-core), survey 4.1.1 (Debian r-cran-survey). Run: Rscript cramers-v-design.R
library(survey)
options(survey.lonely.psu = "adjust", digits = 17)
d <- read.csv("stratified_clustered.csv")
d$stratum2 <- interaction(d$wave, d$stratum)
st <- svydesign(ids = ~psu, strata = ~stratum2, weights = ~w, data = d, nest = TRUE)
chisq <- svychisq(~cat + wave, st, statistic = "Chisq")
x2 <- unname(chisq$statistic)            # Pearson's X2 of the weighted table scaled to n
df <- unname(chisq$parameter)
# mean generalised design effect: X2 / dbar is the statistic whose chi-square p svychisq reports
dbar <- x2 / qchisq(chisq$p.value, df, lower.tail = FALSE)
n <- nrow(d)
kish <- function(w) sum(w)^2 / sum(w^2)
shares <- function(wave) { s <- tapply(d$w[d$wave == wave], factor(d$cat[d$wave == wave], levels = 1:4), sum)
                           s[is.na(s)] <- 0; s / sum(s) }
na <- kish(d$w[d$wave == "A"]); nb <- kish(d$w[d$wave == "B"])
tab <- rbind(na * shares("A"), nb * shares("B"))
v <- sqrt(suppressWarnings(chisq.test(tab, correct = FALSE))$statistic / (na + nb))
limits <- function(stat, neff) {
  lim <- function(prob) {
    if (pchisq(stat, df, ncp = 0) < prob) return(0)
    uniroot(function(l) pchisq(stat, df, ncp = l) - prob, c(0, 10 * stat + 100), tol = 1e-14)$root
  }
  sqrt(c(lim(0.975), lim(0.025)) / neff)
}
design <- limits(v^2 * n / dbar, n / dbar)
kishci <- limits(v^2 * (na + nb), na + nb)
cat(sprintf("n %d dbar %.15g kish sizes %.15g %.15g\n", n, dbar, na, nb))
cat(sprintf("V %.15g design %.15g %.15g kish %.15g %.15g\n", v, design[1], design[2], kishci[1], kishci[2]))
