# R's lm on the exact degree-5 polynomial y = 1 + x + x^2 + x^3 + x^4 + x^5, x = 0..20
# (the data of NIST StRD Wampler1; every coefficient is 1 by construction).
# Prints R's coefficients at 17 significant digits, for the refinement test.
script_dir <- dirname(normalizePath(sub("^--file=", "", grep("^--file=", commandArgs(FALSE), value = TRUE))))
source(file.path(script_dir, "json.R"))
x <- 0:20
y <- 1 + x + x^2 + x^3 + x^4 + x^5
fit <- lm(y ~ x + I(x^2) + I(x^3) + I(x^4) + I(x^5))
emit(list(coefficients = unname(coef(fit)), version = R.version.string))
