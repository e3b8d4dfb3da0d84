# Reference for P2: quantreg::rq(y ~ ., tau = 0.5, method = "fn").
# usage: Rscript ref_rq.R DATA.csv OUT.json fread|read.csv
# Prints one JSON line with read_s and fit_s (elapsed seconds from system.time).
args <- commandArgs(trailingOnly = TRUE)
suppressPackageStartupMessages(library(quantreg))
reader <- args[3]
read_s <- system.time({
  d <- if (reader == "fread") as.data.frame(data.table::fread(args[1])) else read.csv(args[1])
})[["elapsed"]]
fit_s <- system.time(fit <- rq(y ~ ., data = d, tau = 0.5, method = "fn"))[["elapsed"]]
beta <- coef(fit)
objective <- sum(abs(d$y - as.vector(model.matrix(~ ., d[, -1]) %*% beta)))
names <- c("b0", paste0("b", seq_len(length(beta) - 1)))
coefs <- paste0('"', names, '": ', format(beta, digits = 17), collapse = ", ")
writeLines(sprintf('{"objective": %s, "coefficients": {%s}}', format(objective, digits = 17), coefs), args[2])
cat(sprintf('{"read_s": %.6f, "fit_s": %.6f}\n', read_s, fit_s))
