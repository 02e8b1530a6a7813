# Writes the least-squares fit of log(wage) ~ experience + experience^2 +
# education + ethnicity on CPS1988 (R package AER; Debian r-cran-aer), the
# Mincer-type model of the example on the package's help page ?CPS1988, with
# R's lm(), as JSON
# for paygrove's linear baseline check.
# Usage: Rscript tests/reference/lm_cps1988.R OUTFILE
args <- commandArgs(trailingOnly = TRUE)
out <- if (length(args) >= 1) args[1] else "fixtures/reference/lm_cps1988.json"
suppressPackageStartupMessages(library(AER))
data("CPS1988", package = "AER")
fit <- lm(log(wage) ~ experience + I(experience^2) + education + ethnicity, data = CPS1988)
co <- coef(fit)
se <- sqrt(diag(vcov(fit)))
num <- function(x) sprintf("%.17g", x)
entries <- paste0('    "', names(co), '": {"estimate": ', num(co), ', "se": ', num(se), "}")
json <- paste0(
  "{\n",
  '  "source": "R ', getRversion(), " lm(), AER ", packageVersion("AER"),
  '; written by tests/reference/lm_cps1988.R",\n',
  '  "formula": "log(wage) ~ experience + I(experience^2) + education + ethnicity",\n',
  '  "rows": ', nrow(CPS1988), ",\n",
  '  "residualSd": ', num(summary(fit)$sigma), ",\n",
  '  "coefficients": {\n', paste(entries, collapse = ",\n"), "\n  }\n}\n"
)
cat(json, file = out)
