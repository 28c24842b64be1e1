# Reference figures for a linear model, for cross-checks of lib/readiness/stats.
# Usage: Rscript lm-check.R data.csv "<formula>" "<groups>"
#   groups: "name=col1,col2;name2=col3" — design columns of each GVIF group (Fox & Monette 1992),
#   computed here straight from the correlation matrix of model.matrix (no factor updating).
args <- commandArgs(trailingOnly = TRUE)
script_dir <- dirname(normalizePath(sub("^--file=", "", grep("^--file=", commandArgs(FALSE), value = TRUE))))
source(file.path(script_dir, "json.R"))
suppressPackageStartupMessages(library(car))

d <- read.csv(args[1], stringsAsFactors = TRUE)
fit <- lm(as.formula(args[2]), data = d)
s <- summary(fit)
X <- model.matrix(fit)
aliased <- is.na(coef(fit))
Xk <- X[, !aliased, drop = FALSE]

# Belsley, Kuh & Welsch (1980): unit-length columns, intercept included, not centred
Z <- sweep(Xk, 2, sqrt(colSums(Xk^2)), "/")
sv <- svd(Z)
phi <- sweep(sv$v^2, 2, sv$d^2, "/")           # phi[j, k] = v_jk^2 / d_k^2
pi_kj <- t(sweep(phi, 1, rowSums(phi), "/"))   # rows: dimension k, columns: design column j

# GVIF from the formula det(R11) det(R22) / det(R) on the correlation of non-intercept columns
C <- cor(Xk[, colnames(Xk) != "(Intercept)", drop = FALSE])
gv <- list()
if (length(args) >= 3 && nchar(args[3]) > 0) {
  for (g in strsplit(args[3], ";")[[1]]) {
    parts <- strsplit(g, "=")[[1]]
    cols <- strsplit(parts[2], ",")[[1]]
    inside <- colnames(C) %in% cols
    val <- det(C[inside, inside, drop = FALSE]) * det(C[!inside, !inside, drop = FALSE]) / det(C)
    gv[[parts[1]]] <- list(gvif = val, df = sum(inside))
  }
}

# car::vif on the model without aliased columns (car refuses aliased coefficients)
vif_out <- NULL
if (sum(!aliased) > 2) {
  terms_ok <- attr(terms(fit), "term.labels")
  al <- alias(fit)$Complete
  if (!is.null(al)) terms_ok <- setdiff(terms_ok, rownames(al))
  refit <- lm(reformulate(terms_ok, response = all.vars(as.formula(args[2]))[1]), data = d)
  has_interaction <- any(grepl(":", terms_ok))
  if (!has_interaction) {
    v <- car::vif(refit)
    if (is.matrix(v)) {
      vif_out <- list(terms = rownames(v), gvif = v[, 1], df = v[, 2], scaled = v[, 3])
    } else {
      vif_out <- list(terms = names(v), gvif = unname(v), df = rep(1, length(v)), scaled = sqrt(unname(v)))
    }
  }
}

al <- alias(fit)$Complete
emit(list(
  names = colnames(X),
  coef = unname(coef(fit)),
  se = unname(s$coefficients[, 2]),
  rss = deviance(fit),
  dfResidual = fit$df.residual,
  rank = fit$rank,
  r2 = s$r.squared,
  adjr2 = s$adj.r.squared,
  sigma = s$sigma,
  fstat = unname(s$fstatistic),
  fp = if (is.null(s$fstatistic)) NULL else unname(pf(s$fstatistic[1], s$fstatistic[2], s$fstatistic[3], lower.tail = FALSE)),
  aliasRows = if (is.null(al)) list() else as.list(rownames(al)),
  aliasCoef = if (is.null(al)) list() else al,
  aliasCols = if (is.null(al)) list() else as.list(colnames(al)),
  condition = sv$d[1] / sv$d,
  proportions = pi_kj,
  keptNames = colnames(Xk),
  cor = C,
  gvif = gv,
  vif = vif_out
))
