# Helpers shared by the R front end for phrasing rows in messages.

# "4, 17, 88" (1-based rows; at most `most` listed, then "...")
pwb_format_rows <- function(rows, most = 8L) {
  rows <- as.integer(rows)
  txt <- paste(utils::head(rows, most), collapse = ", ")
  if (length(rows) > most) txt <- paste0(txt, ", ...")
  txt
}

pwb_plural <- function(n, one, many = paste0(one, "s")) if (n == 1L) one else many
