# Reference values for design-based estimation, computed with R's `survey` package on data sets
# that package ships (data(api): the stratified sample of schools `apistrat` and the one-stage
# cluster sample `apiclus1`; data(nhanes): a stratified two-PSU-per-stratum cluster sample).
# Writes the needed columns as CSV files beside this script and the reference values to
# survey-design.json. Run from the repository root: Rscript test/reference/survey-design.R
suppressPackageStartupMessages({ library(survey); library(jsonlite) })
here <- "test/reference"
data(api)
data(nhanes)

# Columns used, with names that need no quoting (dots become underscores).
strat <- data.frame(snum = apistrat$snum, stype = as.character(apistrat$stype), pw = apistrat$pw,
  fpc = apistrat$fpc, api00 = apistrat$api00, enroll = apistrat$enroll,
  awards = as.character(apistrat$awards), comp_imp = as.character(apistrat$comp.imp))
# The same population sizes given as sampling fractions n_h / N_h.
strat$fpcf <- ave(strat$fpc, strat$stype, FUN = function(N) length(N) / N)
clus <- data.frame(snum = apiclus1$snum, dnum = apiclus1$dnum, stype = as.character(apiclus1$stype),
  pw = apiclus1$pw, fpc = apiclus1$fpc, api00 = apiclus1$api00, enroll = apiclus1$enroll,
  awards = as.character(apiclus1$awards))
nh <- data.frame(seqn = seq_len(nrow(nhanes)), psu = nhanes$SDMVPSU, stratum = nhanes$SDMVSTRA,
  wt = nhanes$WTMEC2YR, hi_chol = nhanes$HI_CHOL, race = nhanes$race, sex = nhanes$RIAGENDR)
# A stratum left with one PSU: stratum 75 without its PSU 2 (for the single-cluster rule).
nhl <- nh[!(nh$stratum == 75 & nh$psu == 2), ]

write.csv(strat, file.path(here, "survey-apistrat.csv"), row.names = FALSE, na = "")
write.csv(clus, file.path(here, "survey-apiclus1.csv"), row.names = FALSE, na = "")
write.csv(nh, file.path(here, "survey-nhanes.csv"), row.names = FALSE, na = "")
write.csv(nhl, file.path(here, "survey-nhanes-lonely.csv"), row.names = FALSE, na = "")

ci_df <- function(des) degf(des)

# One estimate of a mean: svymean with deff = TRUE (R's default deff: against simple random
# sampling without replacement of the same size from N = sum of weights), and confint with the
# t quantile on the design's degrees of freedom.
mean_of <- function(des, v) {
  f <- as.formula(paste0("~", v))
  d <- eval(bquote(subset(des, !is.na(.(as.name(v))))))
  m <- svymean(f, d, deff = TRUE)
  ci <- confint(m, df = degf(d))
  list(kind = "mean", item = v, n = sum(weights(d) != 0), estimate = unname(coef(m)), se = unname(as.numeric(SE(m))),
    deff = unname(deff(m)), df = degf(d), ciLow = ci[1, 1], ciHigh = ci[1, 2],
    calls = "svymean(deff=TRUE); confint(df=degf)")
}
# Percent of each code: svymean of the indicator with deff = TRUE, and svyciprop(method = "logit")
# (t quantile on degf of the design).
percents_of <- function(des, v) {
  d <- eval(bquote(subset(des, !is.na(.(as.name(v))))))
  vals <- sort(unique(d$variables[[v]][weights(d) != 0]))
  lapply(vals, function(code) {
    d$variables$.ind <- as.numeric(d$variables[[v]] == code)
    m <- svymean(~.ind, d, deff = TRUE)
    cp <- svyciprop(~.ind, d, method = "logit")
    ci <- attr(cp, "ci")
    list(kind = "percent", item = v, code = code, n = sum(weights(d) != 0), estimate = unname(coef(m)),
      se = unname(as.numeric(SE(m))), deff = unname(deff(m)), df = degf(d), ciLow = unname(ci[1]), ciHigh = unname(ci[2]),
      calls = "svymean(deff=TRUE); svyciprop(method='logit')")
  })
}
# Domains: the same on the subset design (rows outside the domain keep their design information,
# as svyby does); svyby's SE is checked to agree.
by_domain <- function(des, v, by, kind) {
  codes <- sort(unique(des$variables[[by]]))
  out <- list()
  for (code in codes) {
    d <- eval(bquote(subset(des, .(as.name(by)) == .(code))))
    res <- if (kind == "mean") list(mean_of(d, v)) else percents_of(d, v)
    for (r in res) { r$by <- by; r$domain <- code; out[[length(out) + 1]] <- r }
  }
  if (kind == "mean") {
    sb <- svyby(as.formula(paste0("~", v)), as.formula(paste0("~", by)), des, svymean, na.rm = TRUE)
    stopifnot(isTRUE(all.equal(unname(SE(sb)), sapply(out, function(r) r$se))))
  }
  out
}

case <- function(name, file, des, spec, means, percents, by) {
  est <- list()
  for (v in means) est[[length(est) + 1]] <- mean_of(des, v)
  for (v in percents) est <- c(est, percents_of(des, v))
  if (!is.null(by)) {
    for (v in means) est <- c(est, by_domain(des, v, by, "mean"))
    for (v in percents) est <- c(est, by_domain(des, v, by, "percent"))
  }
  list(name = name, file = file, design = spec, degf = degf(des), estimates = est)
}

options(survey.lonely.psu = "fail")
cases <- list(
  case("apistrat, strata and population sizes", "survey-apistrat.csv",
    svydesign(id = ~1, strata = ~stype, weights = ~pw, fpc = ~fpc, data = strat),
    list(weight = "pw", strata = "stype", fpc = "fpc"), c("api00", "enroll"), c("awards"), "comp_imp"),
  case("apistrat, strata and sampling fractions", "survey-apistrat.csv",
    svydesign(id = ~1, strata = ~stype, weights = ~pw, fpc = ~fpcf, data = strat),
    list(weight = "pw", strata = "stype", fpc = "fpcf"), c("api00"), c("awards"), NULL),
  case("apistrat, strata, no fpc", "survey-apistrat.csv",
    svydesign(id = ~1, strata = ~stype, weights = ~pw, data = strat),
    list(weight = "pw", strata = "stype"), c("api00", "enroll"), c("awards"), "comp_imp"),
  case("apiclus1, one-stage clusters and population size", "survey-apiclus1.csv",
    svydesign(id = ~dnum, weights = ~pw, fpc = ~fpc, data = clus),
    list(weight = "pw", cluster = "dnum", fpc = "fpc"), c("api00", "enroll"), c("awards"), "stype"),
  case("apiclus1, one-stage clusters, no fpc", "survey-apiclus1.csv",
    svydesign(id = ~dnum, weights = ~pw, data = clus),
    list(weight = "pw", cluster = "dnum"), c("api00", "enroll"), c("awards", "stype"), "stype"),
  case("nhanes, strata and clusters (nested)", "survey-nhanes.csv",
    svydesign(id = ~psu, strata = ~stratum, weights = ~wt, nest = TRUE, data = nh),
    list(weight = "wt", strata = "stratum", cluster = "psu"), c("hi_chol"), c("race", "hi_chol"), "sex")
)
# The single-cluster stratum: R's survey.lonely.psu = "adjust" (the lonely PSU is compared with
# the mean over all PSUs rather than its stratum's, which it alone makes up).
options(survey.lonely.psu = "adjust")
cases[[length(cases) + 1]] <- case("nhanes without stratum 75's second PSU, lonely PSU adjusted", "survey-nhanes-lonely.csv",
  svydesign(id = ~psu, strata = ~stratum, weights = ~wt, nest = TRUE, data = nhl),
  list(weight = "wt", strata = "stratum", cluster = "psu", singleCluster = "adjust"), c("hi_chol"), c("race", "hi_chol"), "sex")

# Weights scaled to the sample size (sum of weights = n): the design effect against simple random
# sampling with replacement, R's deff = "replace".
options(survey.lonely.psu = "fail")
strat1 <- strat; strat1$pw1 <- strat$pw * nrow(strat) / sum(strat$pw)
d1 <- svydesign(id = ~1, strata = ~stype, weights = ~pw1, data = strat1)
m1 <- svymean(~api00, d1, deff = "replace")
replace_case <- list(file = "survey-apistrat.csv", design = list(weight = "pw * 200 / sum(pw)", strata = "stype"), item = "api00",
  estimate = unname(coef(m1)), se = unname(as.numeric(SE(m1))), deff = unname(deff(m1)), calls = "svymean(deff='replace')")

out <- list(
  replace = replace_case,
  source = paste0("R ", R.version$major, ".", R.version$minor, ", survey ", packageVersion("survey"),
    " (svydesign, svymean deff=TRUE, confint df=degf, svyciprop method='logit', svyby)"),
  cases = cases
)
writeLines(toJSON(out, auto_unbox = TRUE, digits = NA, pretty = TRUE), file.path(here, "survey-design.json"))
cat("wrote", file.path(here, "survey-design.json"), "\n")
