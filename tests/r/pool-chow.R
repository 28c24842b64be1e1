# Reference figures for the pool's poolability questions (lib/readiness/pooling).
# Usage: Rscript pool-chow.R pool.csv "<rhs>" [candidate batch id]
#   pool.csv: the model's columns, `batch` (batch id) and `grp` (provider) per row.
# Chow tests as nested lm fits compared by anova (Chow 1960): lm(y ~ X) against
# lm(y ~ X * g), g the indicator of one batch (or provider); the whole pool against
# lm(y ~ X * batch); Chow's predictive test by hand from two lm fits; batch influence
# |b_all - b_rest| / se_all from two lm fits; the overall F from summary.lm.
args <- commandArgs(trailingOnly = TRUE)
script_dir <- dirname(normalizePath(sub("^--file=", "", grep("^--file=", commandArgs(FALSE), value = TRUE))))
source(file.path(script_dir, "json.R"))

d <- read.csv(args[1], stringsAsFactors = TRUE)
rhs <- args[2]
cand <- if (length(args) >= 3) args[3] else ""
f0 <- as.formula(paste("y ~", rhs))
chow <- function(data, g) {
  data$g <- factor(g)
  a <- anova(lm(f0, data = data), lm(as.formula(paste("y ~ (", rhs, ") * g")), data = data))
  list(F = a$F[2], df1 = a$Df[2], df2 = a$Res.Df[2], p = a[["Pr(>F)"]][2])
}
predictive <- function(data, inb) {
  all <- lm(f0, data = data)
  rest <- lm(f0, data = data[!inb, ])
  nb <- sum(inb)
  rss_all <- sum(residuals(all)^2)
  rss_rest <- sum(residuals(rest)^2)
  F <- ((rss_all - rss_rest) / nb) / (rss_rest / rest$df.residual)
  list(F = F, df1 = nb, df2 = rest$df.residual, p = pf(F, nb, rest$df.residual, lower.tail = FALSE))
}
pool <- if (nchar(cand)) d[d$batch != cand, ] else d
pool$batch <- droplevels(pool$batch)
pool$grp <- droplevels(pool$grp)
fit <- lm(f0, data = pool)
s <- summary(fit)
k <- fit$rank
ids <- levels(pool$batch)
batches <- list()
for (b in ids) {
  inb <- pool$batch == b
  rest <- lm(f0, data = pool[!inb, ])
  shift <- abs(coef(fit) - coef(rest)) / sqrt(diag(vcov(fit)))
  batches[[b]] <- list(
    n = sum(inb),
    chow = chow(pool, inb),
    predictive = if (sum(inb) <= k) predictive(pool, inb) else NULL,
    shift = unname(shift), r2_rest = summary(rest)$r.squared, df_rest = rest$df.residual
  )
}
providers <- list()
for (g in levels(pool$grp)) {
  ing <- pool$grp == g
  providers[[g]] <- list(chow = chow(pool, ing), predictive = if (sum(ing) <= k) predictive(pool, ing) else NULL)
}
whole <- anova(fit, lm(as.formula(paste("y ~ (", rhs, ") * batch")), data = pool))
out <- list(
  names = names(coef(fit)), coef = unname(coef(fit)), se = unname(sqrt(diag(vcov(fit)))),
  overall = list(F = unname(s$fstatistic[1]), df1 = unname(s$fstatistic[2]), df2 = unname(s$fstatistic[3]),
                 p = unname(pf(s$fstatistic[1], s$fstatistic[2], s$fstatistic[3], lower.tail = FALSE)),
                 r2 = s$r.squared, adjR2 = s$adj.r.squared),
  whole = list(F = whole$F[2], df1 = whole$Df[2], df2 = whole$Res.Df[2], p = whole[["Pr(>F)"]][2]),
  batches = batches, providers = providers
)
if (nchar(cand)) {
  inb <- d$batch == cand
  all <- lm(f0, data = d)
  shift <- abs(coef(all) - coef(fit)) / sqrt(diag(vcov(all)))
  out$candidate <- list(chow = chow(d, inb), shift = unname(shift))
}
emit(out)
