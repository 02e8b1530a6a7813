# Weighted isotonic (nondecreasing) regression by R's Iso::pava (Debian
# r-cran-iso), for the check of paygrove's pool-adjacent-violators fit
# (lib/bands/isotonic.ts). The cases: a small hand case; log midpoints of
# seven levels that dip twice, weighted by invented head counts; 60 values
# and whole-number weights drawn with set.seed(7); a constant and a falling
# sequence. Each case: y, w and pava(y, w).
#
# Usage, from the project root:
#   Rscript tests/reference/pava.R [OUTFILE]
args <- commandArgs(trailingOnly = TRUE)
out <- if (length(args) >= 1) args[1] else "fixtures/reference/pava.json"
suppressPackageStartupMessages(library(Iso))
set.seed(7)
cases <- list(
  hand = list(y = c(1, 3, 1, 4), w = c(1, 1, 3, 1)),
  midpoints = list(
    y = log(c(42000, 47000, 46000, 55000, 53000, 52000, 70000)),
    w = c(120, 80, 15, 60, 9, 4, 30)
  ),
  random = list(y = round(runif(60) * 10 + (1:60) / 10, 6), w = sample(1:20, 60, replace = TRUE)),
  constant = list(y = rep(2.5, 5), w = c(1, 2, 3, 4, 5)),
  falling = list(y = c(5, 4, 3, 2, 1), w = c(5, 1, 1, 1, 5))
)
num <- function(x) paste0("[", paste(sprintf("%.17g", x), collapse = ", "), "]")
entries <- vapply(names(cases), function(name) {
  c <- cases[[name]]
  paste0('    "', name, '": {"y": ', num(c$y), ', "w": ', num(c$w), ', "fit": ',
         num(pava(c$y, c$w)), "}")
}, "")
json <- paste0(
  "{\n",
  '  "source": "R ', getRversion(), " Iso::pava, Iso ", packageVersion("Iso"),
  '; written by tests/reference/pava.R",\n',
  '  "cases": {\n', paste(entries, collapse = ",\n"), "\n  }\n}\n"
)
cat(json, file = out)
