# Writes the small household waves the import tests load, with R 4.2.2 and haven 2.5.1 (Debian r-cran-haven):
#   Rscript household-waves.R            (run in this folder)
# household-q1.sav   byte-compressed: value labels, a user-missing code and range, text with value labels,
#                    a 300-character text, a date, a date-time, an integer-valued F3.0, a fractional F1.0, a weight
# household-q2.zsav  the next wave, zlib-compressed, the same variables with two names in capitals
# household-q3.sav   a wave that brings a variable (Pets) the table does not have
library(haven)
stopifnot(packageVersion("haven") == "2.5.1")

fmt <- function(x, f) { attr(x, "format.spss") <- f; x }

wave <- function(ids, ages, incomes, regions, tenures, rooms, dates, times, weights) {
  n <- length(ids)
  data.frame(
    id = fmt(as.numeric(ids), "F4.0"),
    region = fmt(labelled_spss(as.numeric(regions), label = "Region of the home",
                               labels = c(North = 1, South = 2, East = 3, Refused = 9), na_values = 9), "F1.0"),
    age = fmt(labelled_spss(as.numeric(ages), label = "Age in years",
                            labels = c("No answer" = -99), na_range = c(-99, -91)), "F3.0"),
    income = fmt(labelled_spss(incomes, label = "Monthly income"), "F8.2"),
    tenure = labelled_spss(tenures, label = "Tenure of the home",
                           labels = c(Owner = "OWN", "Private tenant" = "RENT", "Council tenant" = "COUN")),
    rooms = fmt(as.numeric(rooms), "F1.0"),
    note = fmt(strrep(c("a", "b", "c", "d", "e", "f")[seq_len(n)], 300), "A300"),
    interviewed = dates,
    started = times,
    weight = fmt(weights, "F8.4"),
    stringsAsFactors = FALSE
  )
}

q1 <- wave(ids = 1:6, ages = c(34, 51, -99, 27, 68, -92),
           incomes = c(1510.25, 2380.5, NA, 990, 3100.75, 1800),
           regions = c(1, 2, 3, 9, 1, 2), tenures = c("OWN", "RENT", "COUN", "OWN", "COUN", "RENT"),
           rooms = c(3, 2.5, 4, 1, 5, 2),
           dates = as.Date(c("2025-01-06", "2025-01-07", "2025-01-07", "2025-02-11", "2025-03-01", NA)),
           times = as.POSIXct(c("2025-01-06 09:15:00", "2025-01-07 18:40:30", "2025-01-07 12:00:00",
                                "2025-02-11 08:05:00", "2025-03-01 17:30:00", NA), tz = "UTC"),
           weights = c(0.8125, 1.25, 1, 0.9375, 1.5, 0.5))
write_sav(q1, "household-q1.sav", compress = "byte")

q2 <- wave(ids = 7:11, ages = c(45, 19, 77, -99, 38),
           incomes = c(2210, 1300.4, 1950, 2500, NA),
           regions = c(3, 3, 1, 2, 9), tenures = c("RENT", "OWN", "OWN", "COUN", "RENT"),
           rooms = c(2, 3, 6, 2, 4),
           dates = as.Date(c("2025-04-02", "2025-04-03", "2025-05-20", "2025-06-01", "2025-06-30")),
           times = as.POSIXct(c("2025-04-02 10:00:00", "2025-04-03 11:11:11", "2025-05-20 19:45:00",
                                "2025-06-01 07:30:00", "2025-06-30 23:59:59"), tz = "UTC"),
           weights = c(1, 1.125, 0.875, 1.0625, 0.9375))
names(q2)[names(q2) == "region"] <- "REGION"
names(q2)[names(q2) == "age"] <- "Age"
write_sav(q2, "household-q2.zsav", compress = "zsav")

q3 <- wave(ids = 12:13, ages = c(50, 60), incomes = c(1000, 2000), regions = c(1, 2),
           tenures = c("OWN", "RENT"), rooms = c(2, 3),
           dates = as.Date(c("2025-07-01", "2025-07-02")),
           times = as.POSIXct(c("2025-07-01 10:00:00", "2025-07-02 10:00:00"), tz = "UTC"),
           weights = c(1, 1))
q3$Pets <- c(1, 0)
write_sav(q3, "household-q3.sav", compress = "byte")

# What R reads back, for the tests' expected values (user_na = TRUE keeps the user-missing codes as values).
for (f in c("household-q1.sav", "household-q2.zsav", "household-q3.sav")) {
  cat("==", f, "\n")
  print(as.data.frame(lapply(read_sav(f, user_na = TRUE), function(x) if (is.character(x)) substr(x, 1, 3) else x)))
}
