# Reference values for the drift statistics of `codeweir compare`, computed with R's own stats
# package: ks.test (two-sample, two-sided; exact and asymptotic) and chisq.test on 2 x k tables
# (test of homogeneity, correct = FALSE). PSI is computed here from its definition (shares, an
# empty share set to 1e-4, deciles of the reference sample as type 7 quantiles).
# Run from the repository root: Rscript test/reference/drift.R
library(jsonlite)
set.seed(20261202)
ks <- function(x, y, exact = NULL) {
  r <- suppressWarnings(ks.test(x, y, exact = exact))
  list(x = x, y = y, exact = if (is.null(exact)) NULL else exact,
       statistic = unname(r$statistic), p = r$p.value, method = r$method)
}
round1 <- function(v) round(v, 1)
ksCases <- list(
  small_no_ties = ks(c(0.61, 0.29, 0.06, 0.59, -1.73, -0.74, 0.51, -0.56, 0.39, 1.64, 0.05, -0.06, 0.64, -0.82, 0.37, 1.77, 1.09, -1.28, 2.36, 1.31, 1.05, -0.32, -0.4, 1.06, -2.47),
                     c(2.2, 1.66, 1.38, 0.2, 0.36, 0, 0.96, 1.56, 0.44, 1.5, -0.3, 0.66, 2.31, 3.29, -0.27, -0.37, 0.38, 0.7, 0.52, -0.71)),
  small_ties = ks(c(1, 2, 2, 3, 4, 5, 5, 5, 7), c(2, 3, 3, 6, 7, 8, 9, 9)),
  small_ties_asymptotic = ks(c(1, 2, 2, 3, 4, 5, 5, 5, 7), c(2, 3, 3, 6, 7, 8, 9, 9), exact = FALSE),
  integers_exact = ks(sample(1:6, 60, TRUE), sample(1:7, 80, TRUE)),
  unequal_sizes = ks(round1(rnorm(7, 10, 2)), round1(rnorm(300, 11, 2))),
  forced_exact = ks(round(rnorm(150, 40, 12)), round(rnorm(120, 43, 12)), exact = TRUE),
  large_asymptotic = ks(round1(rnorm(400, 40, 12)), round1(rnorm(500, 42, 12))),
  large_shift = ks(round(rlnorm(3000, 3, 0.5)), round(rlnorm(2500, 3.1, 0.5))),
  identical = ks(c(1, 2, 3, 4, 5), c(1, 2, 3, 4, 5))
)
chi <- function(prev, cur) {
  t <- rbind(prev, cur)
  keep <- colSums(t) > 0
  r <- chisq.test(t[, keep, drop = FALSE], correct = FALSE)
  list(previous = prev, current = cur, statistic = unname(r$statistic), df = unname(r$parameter), p = r$p.value)
}
chiCases <- list(
  three_codes = chi(c(120, 340, 95), c(101, 372, 140)),
  with_new_code = chi(c(50, 60, 0, 30), c(45, 52, 20, 33)),
  two_codes = chi(c(30, 70), c(45, 55)),
  stable = chi(c(200, 300, 500), c(201, 299, 500)),
  unused_code = chi(c(10, 0, 25, 40), c(12, 0, 30, 28))
)
psiCounts <- function(r, c) {
  keep <- (r + c) > 0
  r <- r[keep]; c <- c[keep]
  rs <- ifelse(r == 0, 1e-4, r / sum(r)); cs <- ifelse(c == 0, 1e-4, c / sum(c))
  sum((cs - rs) * log(cs / rs))
}
psiBinned <- function(ref, cur) {
  cuts <- unique(unname(quantile(ref, (1:9) / 10, type = 7)))
  bin <- function(v) tabulate(findInterval(v, cuts, left.open = TRUE) + 1, nbins = length(cuts) + 1)
  list(reference = ref, current = cur, cuts = cuts, psi = psiCounts(bin(ref), bin(cur)))
}
psiCases <- list(
  counts = lapply(chiCases, function(k) list(previous = k$previous, current = k$current, psi = psiCounts(k$previous, k$current))),
  binned_shift = psiBinned(round1(rnorm(500, 40, 10)), round1(rnorm(450, 44, 11))),
  binned_ties = psiBinned(sample(0:12, 300, TRUE), sample(0:14, 320, TRUE))
)
# Two small deliveries for the end-to-end compare: one nominal and one ratio item.
delivery <- list(
  previous = list(region = sample(1:4, 240, TRUE, prob = c(0.4, 0.3, 0.2, 0.1)), income = round(rlnorm(240, 6, 0.6))),
  current = list(region = sample(1:4, 260, TRUE, prob = c(0.3, 0.3, 0.25, 0.15)), income = round(rlnorm(260, 6.2, 0.6)))
)
delivery$region <- chi(tabulate(delivery$previous$region, 4), tabulate(delivery$current$region, 4))
delivery$income <- ks(delivery$previous$income, delivery$current$income)
delivery$incomePsi <- psiBinned(delivery$previous$income, delivery$current$income)$psi
delivery$regionPsi <- psiCounts(tabulate(delivery$previous$region, 4), tabulate(delivery$current$region, 4))
out <- list(source = paste0("R ", R.version$major, ".", R.version$minor, ", stats package (ks.test, chisq.test)"),
            ks = ksCases, chisq = chiCases, psi = psiCases, delivery = delivery)
writeLines(toJSON(out, digits = NA, auto_unbox = TRUE, null = "null"), "test/reference/drift.json")
