# Writes the open datasets CPS1988 and CPS1985 from the R package AER
# (Debian: r-cran-aer) as CSV, for paygrove's loader and learner checks.
# Usage: Rscript tests/reference/export_cps.R OUTDIR
# The committed copies in fixtures/ were written by this script; a test reruns
# it when Rscript and AER are installed and compares byte for byte.
args <- commandArgs(trailingOnly = TRUE)
out <- if (length(args) >= 1) args[1] else "fixtures"
suppressPackageStartupMessages(library(AER))
data("CPS1988", package = "AER")
data("CPS1985", package = "AER")
# Factors are written as their labels; numbers with up to 15 significant
# digits (R's default for write.csv), enough to round-trip the stored values.
write.csv(CPS1988, file.path(out, "cps1988.csv"), row.names = FALSE, quote = FALSE)
write.csv(CPS1985, file.path(out, "cps1985.csv"), row.names = FALSE, quote = FALSE)
cat(sprintf("AER %s, R %s\n", packageVersion("AER"), getRversion()))
