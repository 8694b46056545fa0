#!/usr/bin/env Rscript
# Fits bench/model.stan (the portfolio model, written independently in Stan) on the data
# written by bench/model.ts and prints JSON: timings, gradient evaluations, diagnostics from
# R's posterior package and the cells' CAC0 medians with their Monte Carlo standard errors.
#
#   Rscript bench/model-stan.R DATA.json CHAINS WARMUP DRAWS SEED CORES [ADAPT_DELTA]
#
# ADAPT_DELTA is Stan's target acceptance (default 0.8). A higher value gives smaller steps,
# which helps Stan avoid divergent transitions on this posterior, at more gradients per draw.
suppressPackageStartupMessages({
  library(rstan)
  library(posterior)
  library(jsonlite)
})
rstan_options(boost_lib = "/usr/include")   # Debian's r-cran-bh is an empty package
args <- commandArgs(trailingOnly = TRUE)
self <- sub("^--file=", "", grep("^--file=", commandArgs(FALSE), value = TRUE))
here <- dirname(normalizePath(self))
data <- fromJSON(args[1])
chains <- as.integer(args[2]); warmup <- as.integer(args[3]); draws <- as.integer(args[4])
seed <- as.integer(args[5]); cores <- as.integer(args[6])
adapt_delta <- if (length(args) >= 7) as.numeric(args[7]) else 0.8

cache <- Sys.getenv("TRIBUTARY_STAN_CACHE", tempdir())
source_file <- file.path(here, "model.stan")
rds <- file.path(cache, paste0("portfolio-model-", unname(tools::md5sum(source_file)), ".rds"))
compile_s <- 0
if (file.exists(rds)) {
  sm <- readRDS(rds)
} else {
  t0 <- Sys.time()
  sm <- stan_model(source_file, model_name = "portfolio_model")
  compile_s <- as.numeric(difftime(Sys.time(), t0, units = "secs"))
  saveRDS(sm, rds)
}

t0 <- Sys.time()
fit <- sampling(sm, data = data, chains = chains, warmup = warmup, iter = warmup + draws, seed = seed,
                cores = cores, refresh = 0, control = list(adapt_delta = adapt_delta, max_treedepth = 10))
wall <- as.numeric(difftime(Sys.time(), t0, units = "secs"))

sp_all <- get_sampler_params(fit, inc_warmup = TRUE)
sp <- get_sampler_params(fit, inc_warmup = FALSE)
da <- as_draws_array(as.array(fit))
# the named parameters of the specification (the same set is used on the TypeScript side)
keep <- grep("^(mu|tauBrand|tauMarket|tauCell|alpha|lambda|cac0|beta0|beta1|sigma|gamma|delta)\\[", variables(da), value = TRUE)
summ <- summarise_draws(subset_draws(da, variable = keep), "median", rhat, ess_bulk, ess_tail, mcse_median)
cac <- summ[grepl("^cac0\\[", summ$variable), ]
out <- list(
  stan = stan_version(), rstan = as.character(packageVersion("rstan")),
  chains = chains, warmup = warmup, draws = draws, seed = seed, cores = cores, adaptDelta = adapt_delta,
  wallSeconds = wall,
  chainSeconds = unname(rowSums(get_elapsed_time(fit))),
  compileSeconds = compile_s,
  gradientEvaluations = sum(sapply(sp_all, function(s) sum(s[, "n_leapfrog__"]))),
  maxRhat = max(summ$rhat),
  minEssBulk = min(summ$ess_bulk),
  minEssBulkParameter = summ$variable[which.min(summ$ess_bulk)],
  minEssTail = min(summ$ess_tail),
  divergences = sum(sapply(sp, function(s) sum(s[, "divergent__"]))),
  treeDepthMean = mean(unlist(lapply(sp, function(s) s[, "treedepth__"]))),
  stepSizes = sapply(sp, function(s) s[1, "stepsize__"]),
  cac0 = lapply(seq_len(nrow(cac)), function(i) list(name = cac$variable[i], median = cac$median[i], mcseMedian = cac$mcse_median[i]))
)
cat(toJSON(out, auto_unbox = TRUE, digits = NA))
