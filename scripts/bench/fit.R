# The analysis the readiness check replaces, by hand in R (for `npm run bench`):
# read the file with data.table::fread, count missing values per column, tabulate the levels of
# each factor, fit lm with the factors, car::vif, and the scaled condition number of the design
# (Belsley, Kuh & Welsch 1980: unit-length columns, intercept included).
#
#   Rscript scripts/bench/fit.R FILE.csv RESPONSE "num1,num2,..." "factor=level1,level2,..." ...
#
# Factor values outside the planned levels (spelling variants such as "Clay" for "clay") become
# NA, so lm drops those rows as the engine leaves them out of its complete cases. Fields are
# read verbatim (strip.white = FALSE), as the engine reads them.
suppressMessages({ library(data.table); library(car) })
args <- commandArgs(trailingOnly = TRUE)
file <- args[1]
response <- args[2]
numeric <- strsplit(args[3], ",", fixed = TRUE)[[1]]
factors <- lapply(args[-(1:3)], function(s) {
  kv <- strsplit(s, "=", fixed = TRUE)[[1]]
  list(name = kv[1], levels = strsplit(kv[2], ",", fixed = TRUE)[[1]])
})
d <- fread(file, showProgress = FALSE, na.strings = c("", "NA"), strip.white = FALSE)
print(colSums(is.na(d)))
for (f in factors) print(table(d[[f$name]], useNA = "ifany"))
for (f in factors) set(d, j = f$name, value = factor(d[[f$name]], levels = f$levels))
form <- reformulate(c(vapply(factors, `[[`, "", "name"), numeric), response = response)
fit <- lm(form, data = d)
s <- summary(fit)
print(vif(fit))
X <- model.matrix(fit)
X <- sweep(X, 2, sqrt(colSums(X^2)), "/")
cat("condition number", kappa(X, exact = TRUE), "\n")
cat(sprintf("n %d\n", nrow(X)))
cat(sprintf("F %.17g\n", s$fstatistic[1]))
