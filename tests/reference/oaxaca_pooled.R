# The pooled linear decomposition of a gap in mean log pay (Oaxaca 1973;
# Blinder 1973; pooled coefficients with a group indicator, Fortin 2008,
# Jann 2008), by R's lm(), for the check of paygrove's tree-based
# decomposition (lib/gap/decompose_gap.ts).
#
# The table is fixtures/gap_decomposition/linear_gap.csv, an invented table
# written by tests/lib/gap/_linear_gap.ts (seed 1): log pay linear in level,
# years and site with a planted effect of -0.06 for group Q.
#
# The fit: lm(log(pay) ~ level + years + site + group), the level as its
# number (L1 = 1 ... L6 = 6), site and group as factors. Each attribute's
# explained part of the gap of Q against P is the sum over its coefficients
# of coefficient x (mean of the column among P - mean among Q); the
# unexplained part is the group's coefficient, negated (what Q earns less).
#
# Usage, from the project root:
#   Rscript tests/reference/oaxaca_pooled.R [OUTFILE]
args <- commandArgs(trailingOnly = TRUE)
out <- if (length(args) >= 1) args[1] else "fixtures/reference/oaxaca_pooled.json"
t <- read.csv("fixtures/gap_decomposition/linear_gap.csv", stringsAsFactors = FALSE)
t$level <- as.integer(sub("^L", "", t$level))
t$site <- factor(t$site)
t$group <- factor(t$group, levels = c("P", "Q"))
fit <- lm(log(pay) ~ level + years + site + group, data = t)
X <- model.matrix(fit)
co <- coef(fit)
inP <- t$group == "P"
diff <- colMeans(X[inP, , drop = FALSE]) - colMeans(X[!inP, , drop = FALSE])
part <- function(prefix) sum(co[startsWith(names(co), prefix)] * diff[startsWith(names(co), prefix)])
num <- function(x) sprintf("%.17g", x)
json <- paste0(
  "{\n",
  '  "source": "R ', getRversion(), ' lm(); written by tests/reference/oaxaca_pooled.R",\n',
  '  "formula": "log(pay) ~ level + years + site + group",\n',
  '  "rows": ', nrow(t), ",\n",
  '  "rawLog": ', num(mean(log(t$pay[inP])) - mean(log(t$pay[!inP]))), ",\n",
  '  "explained": {"level": ', num(part("level")), ', "years": ', num(part("years")),
  ', "site": ', num(part("site")), "},\n",
  '  "unexplained": ', num(-co[["groupQ"]]), ",\n",
  '  "unexplainedSe": ', num(sqrt(vcov(fit)["groupQ", "groupQ"])), "\n",
  "}\n"
)
cat(json, file = out)
