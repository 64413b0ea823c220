# What R reads back from an SPSS system file: R 4.2.2 with haven 2.5.1 (Debian r-cran-haven),
# haven::read_sav(file, user_na = TRUE). Usage: Rscript readback.R FILE OUTPUT.tsv
# One tab-separated line per fact, UTF-8; tabs, newlines and backslashes in text escaped as \t, \n, \\.
#   var       NAME  CLASS  FORMAT  LABEL          (CLASS: numeric, character, Date, POSIXct, hms)
#   vlabel    NAME  CODE   LABEL
#   na_value  NAME  VALUE
#   na_range  NAME  LOW    HIGH                   (-Inf / Inf for LO / HI)
#   value     ROW   NAME   VALUE                  (NA for a system-missing value)
#   label     FILE-LABEL
suppressPackageStartupMessages(library(haven))
args <- commandArgs(trailingOnly = TRUE)
df <- read_sav(args[1], user_na = TRUE)
esc <- function(x) {
  x <- gsub("\\", "\\\\", x, fixed = TRUE)
  x <- gsub("\t", "\\t", x, fixed = TRUE)
  gsub("\n", "\\n", x, fixed = TRUE)
}
num <- function(x) ifelse(is.na(x), "NA", ifelse(is.infinite(x), ifelse(x > 0, "Inf", "-Inf"), sprintf("%.17g", x)))
text <- function(x) if (is.numeric(x)) num(x) else esc(as.character(x))
lines <- character()
add <- function(...) lines <<- c(lines, paste(..., sep = "\t"))
if (!is.null(attr(df, "label", exact = TRUE))) add("label", esc(attr(df, "label", exact = TRUE)))
for (name in names(df)) {
  x <- df[[name]]
  cls <- if (inherits(x, "POSIXct")) "POSIXct" else if (inherits(x, "Date")) "Date" else if (inherits(x, "hms")) "hms"
         else if (is.character(x)) "character" else "numeric"
  lab <- attr(x, "label", exact = TRUE); fmt <- attr(x, "format.spss", exact = TRUE)
  add("var", esc(name), cls, ifelse(is.null(fmt), "", fmt), ifelse(is.null(lab), "", esc(lab)))
  labels <- attr(x, "labels", exact = TRUE)
  if (!is.null(labels)) for (i in seq_along(labels)) add("vlabel", esc(name), text(unname(labels[i])), esc(names(labels)[i]))
  for (v in attr(x, "na_values")) add("na_value", esc(name), text(v))
  r <- attr(x, "na_range")
  if (!is.null(r)) add("na_range", esc(name), text(r[1]), text(r[2]))
  values <- if (cls == "POSIXct") ifelse(is.na(x), "NA", format(x, "%Y-%m-%dT%H:%M:%S", tz = "UTC"))
            else if (cls == "Date") ifelse(is.na(x), "NA", format(x, "%Y-%m-%d"))
            else if (cls == "character") ifelse(is.na(x), "NA", esc(as.character(x)))
            else num(as.numeric(unclass(x)))
  for (i in seq_along(values)) add("value", i, esc(name), values[i])
}
con <- file(args[2], open = "w", encoding = "UTF-8")
writeLines(lines, con)
close(con)
