# Minimal JSON writer for test scripts (no package dependency): numbers at 17 significant
# digits, NA/NaN/Inf as null, named lists as objects, matrices as arrays of rows.
to_json <- function(x) {
  num <- function(v) ifelse(is.finite(v), sprintf("%.17g", v), "null")
  if (is.null(x)) return("null")
  if (is.matrix(x)) {
    rows <- vapply(seq_len(nrow(x)), function(i) to_json(unname(as.vector(x[i, ]))), "")
    return(paste0("[", paste(rows, collapse = ","), "]"))
  }
  if (is.list(x)) {
    vals <- vapply(x, to_json, "")
    if (!is.null(names(x))) {
      keys <- vapply(names(x), function(k) encodeString(k, quote = '"'), "")
      return(paste0("{", paste(paste0(keys, ":", vals), collapse = ","), "}"))
    }
    return(paste0("[", paste(vals, collapse = ","), "]"))
  }
  if (is.character(x) || is.factor(x)) {
    v <- vapply(as.character(x), function(s) if (is.na(s)) "null" else encodeString(s, quote = '"'), "")
    return(paste0("[", paste(v, collapse = ","), "]"))
  }
  if (is.logical(x)) x <- as.numeric(x)
  paste0("[", paste(num(as.numeric(x)), collapse = ","), "]")
}
emit <- function(x) cat(to_json(x), "\n", sep = "")
