# Distribution values for a grid of arguments (CSV: fn,x,d1,d2,ncp), one value per row.
args <- commandArgs(trailingOnly = TRUE)
script_dir <- dirname(normalizePath(sub("^--file=", "", grep("^--file=", commandArgs(FALSE), value = TRUE))))
source(file.path(script_dir, "json.R"))
g <- read.csv(args[1], stringsAsFactors = FALSE)
val <- vapply(seq_len(nrow(g)), function(i) {
  r <- g[i, ]
  switch(r$fn,
    fUpper = pf(r$x, r$d1, r$d2, lower.tail = FALSE),
    fCdf = pf(r$x, r$d1, r$d2),
    tUpper = pt(r$x, r$d1, lower.tail = FALSE),
    chiUpper = pchisq(r$x, r$d1, lower.tail = FALSE),
    qf = qf(r$x, r$d1, r$d2),
    qt = qt(r$x, r$d1),
    qchisq = qchisq(r$x, r$d1),
    ncf = pf(r$x, r$d1, r$d2, ncp = r$ncp),
    NA_real_)
}, 0)
emit(list(values = val))
