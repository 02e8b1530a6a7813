# Writes heteroskedasticity-robust (HC1) standard errors of two least-squares
# fits on CPS1988 (R package AER; Debian r-cran-aer), computed by the
# sandwich package (a dependency of AER) with vcovHC(type = "HC1"), as JSON
# for the checks of paygrove's residual regression (lib/gap/partial_out.ts)
# and of the linear gap's robust errors (lib/linear/least_squares.ts).
# Usage: Rscript tests/reference/hc1_cps1988.R OUTFILE
args <- commandArgs(trailingOnly = TRUE)
out <- if (length(args) >= 1) args[1] else "fixtures/reference/hc1_cps1988.json"
suppressPackageStartupMessages({
  library(AER)
  library(sandwich)
})
data("CPS1988", package = "AER")
num <- function(x) sprintf("%.17g", x)
fitJson <- function(name, formula) {
  fit <- lm(formula, data = CPS1988)
  co <- coef(fit)
  se <- sqrt(diag(vcovHC(fit, type = "HC1")))
  entries <- paste0('      "', names(co), '": {"estimate": ', num(co), ', "se": ', num(se), "}")
  paste0(
    '    "', name, '": {\n',
    '      "formula": "', deparse(formula), '",\n',
    paste(entries, collapse = ",\n"), "\n    }"
  )
}
json <- paste0(
  "{\n",
  '  "source": "R ', getRversion(), " lm() and sandwich ", packageVersion("sandwich"),
  " vcovHC(type = 'HC1'), AER ", packageVersion("AER"),
  '; written by tests/reference/hc1_cps1988.R",\n',
  '  "rows": ', nrow(CPS1988), ",\n",
  '  "fits": {\n',
  fitJson("one", log(wage) ~ education), ",\n",
  fitJson("two", log(wage) ~ education + experience), ",\n",
  fitJson("three", log(wage) ~ experience + I(experience^2) + education + ethnicity), "\n",
  "  }\n}\n"
)
cat(json, file = out)
