# Writes the haven round-trip fixtures: R 4.2.2 with haven 2.5.1 (Debian r-cran-haven).
# Usage: Rscript write-haven.R OUTPUT_FOLDER
# Writes haven-none.sav (uncompressed), haven-byte.sav (bytecode-compressed) and haven.zsav (zlib-compressed).
suppressPackageStartupMessages(library(haven))
out <- commandArgs(trailingOnly = TRUE)[1]

long_text <- function(prefix, n) paste0(prefix, strrep("x", n - nchar(prefix, type = "bytes")))

df <- data.frame(id = 1:8)
df$region <- labelled_spss(c(1, 2, 3, 4, 5, -9, -8, NA),
                           labels = c("Île-de-France" = 1, "Zürich" = 2, "Łódź" = 3, "North East" = 4,
                                      "Council tenant" = 5, "Refused" = -9),
                           na_values = c(-9, -8), label = "Region of residence")
df$income <- labelled_spss(c(1200.5, 850.25, -99, -95, -1, 3000, NA, 410.75),
                           labels = c("Refused" = -99, "Don't know" = -1),
                           na_values = -1, na_range = c(-99, -91), label = "Net monthly income (€)")
df$age <- labelled_spss(c(34, 51, -1, 70, -7, 18, 44, 29), na_range = c(-Inf, -1), label = "Age in years")
df$score <- labelled_spss(c(1, 5, 97, 99, 3, 2, 98, 4), na_range = c(97, Inf), label = "Satisfaction 1-5")
df$tenure <- labelled_spss(c("COUN", "OWN", "XX", "PRIV", "COUN", "", "OWN", "XX"),
                           labels = c("Council tenant" = "COUN", "Owner occupier" = "OWN", "Not asked" = "XX"),
                           na_values = "XX", label = "Tenure of the home")
df$employer <- labelled_spss(c("Public sector body", "Private firm", "Charity", "NONE GIVEN", "Private firm",
                               "Public sector body", "Charity", "NONE GIVEN"),
                             labels = c("Private company or firm" = "Private firm", "No answer" = "NONE GIVEN"),
                             label = "Employer type")
df$comment <- c(long_text("Très long commentaire: ", 300), "short", "", long_text("Second ", 420),
                "Ünïcödé ✓", long_text("Third ", 256), "x", NA)
df$visit <- as.Date(c("2024-01-15", "1999-12-31", "1582-10-15", NA, "2030-06-01", "1970-01-01", "2024-02-29",
                      "2000-03-01"))
df$stamp <- as.POSIXct(c("2024-01-15 08:30:05", "1999-12-31 23:59:59", NA, "2000-01-01 00:00:00",
                         "1970-01-01 12:00:00", "2024-02-29 06:07:08", "1600-01-01 00:00:01",
                         "2038-01-19 03:14:08"), tz = "UTC")
df$duration <- hms::hms(seconds = c(90, 3600, NA, 0, 86399, 45, 12, 7200))
df$wt <- c(1.25, 0.5, 2, 1, 0.75, 1.5, 1, 3)
attr(df$wt, "label") <- "Design weight"
df$household <- factor(c("single", "couple", "family", "single", "family", "couple", "single", "family"),
                       levels = c("single", "couple", "family"))

write_sav(df, file.path(out, "haven-none.sav"), compress = "none")
write_sav(df, file.path(out, "haven-byte.sav"), compress = "byte")
write_sav(df, file.path(out, "haven.zsav"), compress = "zsav")
