# Reference figures for the selection preview of lib/readiness/pooling.
# Usage: Rscript pool-select.R pool.csv "<candidates, comma-separated>" "<required, comma-separated or empty>" <leaps|loop>
#   leaps: best subset of each size by leaps::regsubsets (exhaustive; numeric candidates), with
#          summary()'s rss, cp, bic, adjr2; and leave-one-batch-out CV, each fold re-selected by
#          regsubsets, fitted by lm and predicted by predict.lm; the BIC-chosen model per fold.
#   paths: the step() paths only (more candidates than an exhaustive search can take).
#   loop:  best subset of each size by an exhaustive loop of lm fits over term subsets
#          (categorical terms enter whole), with extractAIC (k = 2 and log n) and summary.lm's adjusted R².
# Both: step() forward and backward with k = 2 and k = log(n) over the same scope.
args <- commandArgs(trailingOnly = TRUE)
script_dir <- dirname(normalizePath(sub("^--file=", "", grep("^--file=", commandArgs(FALSE), value = TRUE))))
source(file.path(script_dir, "json.R"))
suppressPackageStartupMessages(library(leaps))

d <- read.csv(args[1], stringsAsFactors = TRUE)
cands <- strsplit(args[2], ",")[[1]]
req <- if (nchar(args[3])) strsplit(args[3], ",")[[1]] else character(0)
mode <- args[4]
n <- nrow(d)
form <- function(terms) reformulate(if (length(terms)) terms else "1", response = "y")
full <- lm(form(c(req, cands)), data = d)
sigma2 <- sum(residuals(full)^2) / full$df.residual
crit <- function(fit) {
  rss <- sum(residuals(fit)^2)
  list(rss = rss, edf = fit$rank, aic = extractAIC(fit, k = 2)[2], bic = extractAIC(fit, k = log(n))[2],
       adjR2 = summary(fit)$adj.r.squared, cp = rss / sigma2 - n + 2 * fit$rank)
}
out <- list(n = n)
if (mode == "leaps") {
  rs <- regsubsets(form(cands), data = d, nvmax = length(cands), method = "exhaustive")
  s <- summary(rs)
  tss <- sum((d$y - mean(d$y))^2)
  out$leaps <- list(rss = s$rss, cp = s$cp, bic = s$bic, adjr2 = s$adjr2, tss = tss,
                    which = lapply(seq_len(nrow(s$which)), function(i) colnames(s$which)[s$which[i, ]][-1]))
  # leave-one-batch-out: re-select in each fold, predict the batch left out
  sse <- rep(0, length(cands) + 1)
  chosen <- setNames(rep(0, length(cands)), cands)
  for (b in levels(d$batch)) {
    tr <- d[d$batch != b, ]
    te <- d[d$batch == b, ]
    r <- summary(regsubsets(form(cands), data = tr, nvmax = length(cands), method = "exhaustive"))
    models <- c(list(character(0)), lapply(seq_len(nrow(r$which)), function(i) colnames(r$which)[r$which[i, ]][-1]))
    nt <- nrow(tr)
    rss <- c(sum((tr$y - mean(tr$y))^2), r$rss)
    bic <- nt * log(rss / nt) + log(nt) * (seq_along(rss))
    for (i in seq_along(models)) {
      fit <- lm(form(models[[i]]), data = tr)
      sse[i] <- sse[i] + sum((te$y - predict(fit, newdata = te))^2)
    }
    for (v in models[[which.min(bic)]]) chosen[v] <- chosen[v] + 1
  }
  out$lobo <- list(mspe = sse / n, share = unname(chosen) / nlevels(d$batch), names = cands)
}
if (mode == "loop") {
  best <- list()
  for (size in 0:length(cands)) {
    subsets <- if (size == 0) list(character(0)) else combn(cands, size, simplify = FALSE)
    fits <- lapply(subsets, function(s) lm(form(c(req, s)), data = d))
    rss <- vapply(fits, function(f) sum(residuals(f)^2), 0)
    i <- which.min(rss)
    best[[size + 1]] <- c(list(terms = subsets[[i]]), crit(fits[[i]]))
  }
  out$loop <- best
}
paths <- list()
lower <- form(req)
upper <- form(c(req, cands))
for (k in c(2, log(n))) {
  fwd <- step(lm(lower, data = d), scope = list(lower = lower, upper = upper), direction = "forward", k = k, trace = 0)
  bwd <- step(lm(upper, data = d), scope = list(lower = lower, upper = upper), direction = "backward", k = k, trace = 0)
  key <- if (k == 2) "aic" else "bic"
  paths[[key]] <- list(
    forward = list(steps = as.character(fwd$anova$Step), aic = fwd$anova$AIC, terms = attr(terms(fwd), "term.labels")),
    backward = list(steps = as.character(bwd$anova$Step), aic = bwd$anova$AIC, terms = attr(terms(bwd), "term.labels"))
  )
}
out$paths <- paths
emit(out)
