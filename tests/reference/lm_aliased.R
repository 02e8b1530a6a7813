# Everyday tables whose least-squares design has aliased columns, and R's
# lm() fits of them, for the check of paygrove's pivoted least squares
# (lib/linear/least_squares.ts).
#
# The tables are cut from fixtures/demo_company.csv (the invented Fernhollow
# Instruments demo), as a user's own table would be:
#   one_person_site.csv   the first 39 people not at Cinder Hill and the first
#                         person at Cinder Hill, in file order: one site has a
#                         single person
#   months_and_years.csv  the first 60 people with experience also in months
#                         (12 times the years), a multiple of another column
#   twenty_rows.csv       the first 20 people, every column
# and the demo itself filtered to level G1 (a level column that becomes
# constant).
#
# Each case's design is built here the way paygrove's designOf() builds it
# (stated below, so R is given the same columns in the same order), and
# fitted by lm(), whose QR (LINPACK dqrdc2, tol = 1e-7) leaves aliased
# columns out with NA coefficients. The JSON records each coefficient (null
# for NA), its classical standard error, the residual standard deviation and
# the rank.
#
# Usage, from the project root:
#   Rscript tests/reference/lm_aliased.R [OUTDIR [TABLEDIR]]
# writes OUTDIR/lm_aliased.json (default fixtures/reference) and the three
# tables into TABLEDIR (default fixtures/aliased).
args <- commandArgs(trailingOnly = TRUE)
out <- if (length(args) >= 1) args[1] else "fixtures/reference"
tables <- if (length(args) >= 2) args[2] else "fixtures/aliased"
dir.create(tables, showWarnings = FALSE, recursive = TRUE)

demo <- read.csv("fixtures/demo_company.csv", colClasses = "character",
                 na.strings = character(0), check.names = FALSE)

# The tables as text, exactly as in the demo file (new column: as.character,
# 15 significant digits).
one_person_cols <- c("employee_id", "job_family", "level", "years_experience", "site",
                     "base_pay_eur")
away <- which(demo$site != "Cinder Hill")[1:39]
alone <- which(demo$site == "Cinder Hill")[1]
one_person <- demo[sort(c(away, alone)), one_person_cols]

months <- demo[1:60, c("employee_id", "job_family", "level", "years_experience", "site",
                       "base_pay_eur")]
months <- data.frame(months[, 1:4], months_experience =
                       as.character(12 * as.numeric(months$years_experience)),
                     months[, 5:6], check.names = FALSE)

twenty <- demo[1:20, ]

write_table <- function(df, name) {
  write.csv(df, file.path(tables, name), row.names = FALSE, quote = FALSE)
}
write_table(one_person, "one_person_site.csv")
write_table(months, "months_and_years.csv")
write_table(twenty, "twenty_rows.csv")

# paygrove's design (designOf): features in column order; a numeric column
# as its values (a missing value replaced by the column's mean over the rows
# fitted, then a 0/1 column "NAME missing" when any is missing); an ordinal
# column as its level's position on the ladder (levels of the whole table,
# lowest first, from 0); a categorical column as a 0/1 column "NAME=LEVEL"
# for each level present, in sorted order, except the most frequent (the
# first of equally frequent ones). The identifier employee_id and the
# protected gender are not features; a column with one value in the whole
# table is not either.
design_of <- function(df, rows, features) {
  cols <- list()
  for (name in names(features)) {
    kind <- features[[name]]
    text <- df[[name]][rows]
    if (kind == "numeric") {
      v <- suppressWarnings(as.numeric(ifelse(text == "", NA, text)))
      missing <- is.na(v)
      v[missing] <- mean(v[!missing])
      cols[[name]] <- v
      if (any(missing)) cols[[paste(name, "missing")]] <- as.numeric(missing)
    } else if (kind == "ordinal") {
      present <- unique(df[[name]])
      ladder <- present[order(as.integer(sub("^[A-Za-z]+", "", present)))]
      cols[[name]] <- match(text, ladder) - 1
    } else {
      levels <- sort(unique(df[[name]]), method = "radix")
      counts <- sapply(levels, function(l) sum(text == l))
      base <- which.max(counts)
      for (i in seq_along(levels)) {
        if (i == base || counts[i] == 0) next
        cols[[paste0(name, "=", levels[i])]] <- as.numeric(text == levels[i])
      }
    }
  }
  x <- do.call(cbind, cols)
  colnames(x) <- names(cols)
  x
}

num <- function(x) ifelse(is.na(x), "null", sprintf("%.17g", x))
quoted <- function(x) paste0('"', x, '"', collapse = ", ")

fit_case <- function(name, table, df, rows, features, drop_rows = integer(0)) {
  x <- design_of(df, rows, features)
  y <- log(as.numeric(df$base_pay_eur[rows]))
  if (length(drop_rows) > 0) {
    x <- x[-drop_rows, , drop = FALSE]
    y <- y[-drop_rows]
  }
  fit <- lm(y ~ x)
  co <- coef(fit)
  names(co) <- c("(Intercept)", colnames(x))
  se <- rep(NA_real_, length(co))
  if (fit$df.residual > 0) {
    s <- summary(fit)
    se[!is.na(co)] <- s$coefficients[, "Std. Error"]
    sigma <- s$sigma
  } else {
    sigma <- NA_real_
  }
  paste0(
    '    "', name, '": {\n',
    '      "table": "', table, '",\n',
    '      "rows": ', length(y), ",\n",
    '      "rank": ', fit$rank, ",\n",
    '      "names": [', quoted(names(co)), "],\n",
    '      "aliased": [', if (any(is.na(co))) quoted(names(co)[is.na(co)]) else "", "],\n",
    '      "coefficients": [', paste(num(co), collapse = ", "), "],\n",
    '      "se": [', paste(num(se), collapse = ", "), "],\n",
    '      "residualSd": ', num(sigma), "\n",
    "    }"
  )
}

all_rows <- function(df) seq_len(nrow(df))
base <- list(job_family = "categorical", level = "ordinal", years_experience = "numeric",
             site = "categorical")
everything <- list(job_family = "categorical", level = "ordinal",
                   years_experience = "numeric", years_at_company = "numeric",
                   site = "categorical", performance_rating = "numeric",
                   education = "categorical", remote = "categorical")
g1 <- which(demo$level == "G1")

cases <- c(
  fit_case("one_person_site", "fixtures/aliased/one_person_site.csv", one_person,
           all_rows(one_person), base),
  # The fit without the one person at Cinder Hill (as in the cross-validation
  # fold that holds them out): their site's column is all zeros.
  fit_case("one_person_site_without_them", "fixtures/aliased/one_person_site.csv", one_person,
           all_rows(one_person), base, drop_rows = which(one_person$site == "Cinder Hill")),
  fit_case("months_and_years", "fixtures/aliased/months_and_years.csv", months,
           all_rows(months),
           c(base[1:3], list(months_experience = "numeric"), base[4])),
  fit_case("twenty_rows", "fixtures/aliased/twenty_rows.csv", twenty, all_rows(twenty),
           everything),
  # Without the first two people (as in a fold of 10-fold cross-validation):
  # 18 rows for 19 coefficients.
  fit_case("twenty_rows_without_first_two", "fixtures/aliased/twenty_rows.csv", twenty,
           all_rows(twenty), everything, drop_rows = 1:2),
  fit_case("demo_level_g1", "fixtures/demo_company.csv where level = G1", demo, g1, everything)
)

json <- paste0(
  "{\n",
  '  "source": "R ', getRversion(), ' lm(); written by tests/reference/lm_aliased.R",\n',
  '  "target": "log(base_pay_eur)",\n',
  '  "cases": {\n', paste(cases, collapse = ",\n"), "\n  }\n}\n"
)
cat(json, file = file.path(out, "lm_aliased.json"))
