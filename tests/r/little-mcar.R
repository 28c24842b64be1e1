# Little's (1988) MCAR test written from the paper's formula, row by row:
# EM for mu, Sigma (ML, divisor n) under multivariate normality, then
# d2 = sum_j m_j (ybar_j - mu_j)' Sigma_j^-1 (ybar_j - mu_j), df = sum_j p_j - p.
args <- commandArgs(trailingOnly = TRUE)
script_dir <- dirname(normalizePath(sub("^--file=", "", grep("^--file=", commandArgs(FALSE), value = TRUE))))
source(file.path(script_dir, "json.R"))
Y <- as.matrix(read.csv(args[1]))
Y <- Y[rowSums(!is.na(Y)) > 0, , drop = FALSE]
n <- nrow(Y); p <- ncol(Y)
mu <- colMeans(Y, na.rm = TRUE)
S <- diag(apply(Y, 2, function(v) mean((v - mean(v, na.rm = TRUE))^2, na.rm = TRUE)), p)
for (it in 1:20000) {
  T1 <- numeric(p); T2 <- matrix(0, p, p)
  for (i in 1:n) {
    y <- Y[i, ]; o <- !is.na(y); m <- !o
    yh <- y; C <- matrix(0, p, p)
    if (any(m)) {
      B <- S[m, o, drop = FALSE] %*% solve(S[o, o, drop = FALSE])
      yh[m] <- mu[m] + B %*% (y[o] - mu[o])
      C[m, m] <- S[m, m, drop = FALSE] - B %*% S[o, m, drop = FALSE]
    }
    T1 <- T1 + yh
    T2 <- T2 + yh %*% t(yh) + C
  }
  mu_new <- T1 / n
  S_new <- T2 / n - mu_new %*% t(mu_new)
  done <- max(abs(mu_new - mu)) < 1e-13 * max(1, max(abs(mu))) && max(abs(S_new - S)) < 1e-13 * max(abs(S))
  mu <- mu_new; S <- S_new
  if (done) break
}
key <- apply(!is.na(Y), 1, function(r) paste(as.integer(r), collapse = ""))
d2 <- 0; df <- -p
for (k in unique(key)) {
  rows <- Y[key == k, , drop = FALSE]
  o <- !is.na(rows[1, ])
  yb <- colMeans(rows[, o, drop = FALSE])
  dv <- yb - mu[o]
  d2 <- d2 + nrow(rows) * as.numeric(t(dv) %*% solve(S[o, o, drop = FALSE]) %*% dv)
  df <- df + sum(o)
}
emit(list(statistic = d2, df = df, pValue = pchisq(d2, df, lower.tail = FALSE), iterations = it, mu = mu, sigma = S))
