# Printing tables and text within getOption("width"): a table too wide is split into blocks of
# columns, each block repeating the key column(s) so every row stays identifiable; text is
# wrapped at word boundaries.

# tab: a data frame of character columns (format numbers first); key: names of the columns
# repeated in every block; right: names of right-aligned columns (numbers); width: the line width.
pwb_print_table <- function(tab, key = names(tab)[1L], right = character(0),
                            width = getOption("width", 80L)) {
  cols <- names(tab)
  cells <- lapply(cols, function(cn) {
    v <- as.character(tab[[cn]])
    v[is.na(v)] <- "NA"
    w <- max(nchar(c(cn, v), type = "width"))
    pad <- function(s) formatC(s, width = if (cn %in% right) w else -w)
    c(pad(cn), pad(v))
  })
  names(cells) <- cols
  colw <- vapply(cells, function(x) nchar(x[1L], type = "width"), numeric(1))
  rest <- setdiff(cols, key)
  base <- sum(colw[key]) + length(key) - 1L
  blocks <- list()
  cur <- character(0)
  used <- base
  for (cn in rest) {
    if (length(cur) && used + 1L + colw[[cn]] > width) {
      blocks[[length(blocks) + 1L]] <- cur
      cur <- character(0)
      used <- base
    }
    cur <- c(cur, cn)
    used <- used + 1L + colw[[cn]]
  }
  if (length(cur) || !length(blocks)) blocks[[length(blocks) + 1L]] <- cur
  for (b in seq_along(blocks)) {
    if (b > 1L) cat("\n")
    lines <- do.call(paste, c(unname(cells[c(key, blocks[[b]])]), sep = " "))
    cat(sub("[[:space:]]+$", "", lines), sep = "\n")
  }
  invisible(tab)
}

# Text wrapped to the line width; `exdent` indents continuation lines.
pwb_cat_wrap <- function(..., indent = 0L, exdent = indent + 2L, width = getOption("width", 80L)) {
  txt <- paste0(...)
  for (para in txt)
    cat(strwrap(para, width = width, indent = indent, exdent = exdent), sep = "\n")
}
