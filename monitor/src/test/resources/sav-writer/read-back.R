# What R's haven reads back from SPSS system files, as JSON, for the writer's tests.
# Usage: Rscript read-back.R OUT.json FILE...
# Written for R 4.2.2 with Debian's r-cran-haven 2.5.1 and r-cran-jsonlite 1.8.4.
# Numbers are printed with 17 significant digits so that every double comes back exactly; date-times as seconds
# since 1970-01-01 UTC; user-missing values are kept as values (user_na = TRUE), system-missing values are null.
suppressPackageStartupMessages({
  library(haven)
  library(jsonlite)
})

args <- commandArgs(trailingOnly = TRUE)
out <- args[1]
files <- args[-1]

num <- function(x) vapply(as.numeric(x), function(v) if (is.na(v)) NA_character_ else sprintf("%.17g", v), "")

variable <- function(name, col) {
  kind <- if (inherits(col, "Date")) "date" else if (inherits(col, "POSIXct")) "datetime"
          else if (is.character(col)) "string" else "number"
  values <- switch(kind,
    date = ifelse(is.na(col), NA_character_, format(col, "%Y-%m-%d")),
    datetime = ifelse(is.na(col), NA_character_, sprintf("%.6f", as.numeric(col))),
    string = as.character(unclass(col)),
    number = num(unclass(col)))
  text <- function(x) if (is.character(x)) x else num(x)
  labels <- attr(col, "labels", exact = TRUE)
  list(
    name = name,
    label = attr(col, "label", exact = TRUE),
    format = attr(col, "format.spss", exact = TRUE),
    kind = kind,
    na_values = as.list(text(attr(col, "na_values", exact = TRUE))),
    na_range = as.list(text(attr(col, "na_range", exact = TRUE))),
    labels = lapply(seq_along(labels), function(i) list(value = text(unname(labels[i])), label = names(labels)[i])),
    values = as.list(unname(values)))
}

result <- list()
for (f in files) {
  d <- read_sav(f, user_na = TRUE)
  result[[basename(f)]] <- list(
    reader = paste("R", getRversion(), "haven", packageVersion("haven")),
    file_label = attr(d, "label", exact = TRUE),
    rows = nrow(d),
    variables = lapply(names(d), function(n) variable(n, d[[n]])))
}
writeLines(toJSON(result, auto_unbox = TRUE, null = "null", na = "null", pretty = TRUE, digits = NA), out,
           useBytes = TRUE)
