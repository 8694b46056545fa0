#!/usr/bin/env Rscript
# Side-by-side benchmark, Stan's half: runs one target with rstan (NUTS, diag_e, Stan's
# defaults) and prints JSON with wall time, gradient evaluations and ESS from posterior.
#
#   Rscript run-stan.R TARGET DATA.json CHAINS WARMUP DRAWS SEED CORES
#
# TARGET is eight-schools or scaled-gaussian (the .stan file beside this script).
suppressPackageStartupMessages({
  library(rstan)
  library(posterior)
  library(jsonlite)
})
rstan_options(boost_lib = "/usr/include")   # Debian's r-cran-bh is an empty package
args <- commandArgs(trailingOnly = TRUE)
self <- sub("^--file=", "", grep("^--file=", commandArgs(FALSE), value = TRUE))
here <- dirname(normalizePath(self))
target <- args[1]
data <- fromJSON(args[2])
chains <- as.integer(args[3]); warmup <- as.integer(args[4]); draws <- as.integer(args[5])
seed <- as.integer(args[6]); cores <- as.integer(args[7])

cache <- file.path(tempdir(), "tributary-bench")
dir.create(cache, showWarnings = FALSE)
rds <- file.path(Sys.getenv("TRIBUTARY_STAN_CACHE", cache), paste0(target, ".rds"))
compile_s <- 0
if (file.exists(rds)) {
  sm <- readRDS(rds)
} else {
  t0 <- Sys.time()
  sm <- stan_model(file.path(here, paste0(target, ".stan")), model_name = gsub("-", "_", target))
  compile_s <- as.numeric(difftime(Sys.time(), t0, units = "secs"))
  saveRDS(sm, rds)
}

t0 <- Sys.time()
fit <- sampling(sm, data = data, chains = chains, warmup = warmup, iter = warmup + draws, seed = seed,
                cores = cores, refresh = 0, control = list(adapt_delta = 0.8, max_treedepth = 10))
wall <- as.numeric(difftime(Sys.time(), t0, units = "secs"))

sp_all <- get_sampler_params(fit, inc_warmup = TRUE)
sp <- get_sampler_params(fit, inc_warmup = FALSE)
leapfrogs <- sum(sapply(sp_all, function(s) sum(s[, "n_leapfrog__"])))
elapsed <- get_elapsed_time(fit)
da <- as_draws_array(as.array(fit))
vars <- setdiff(variables(da), "lp__")
ess <- sapply(vars, function(v) ess_bulk(extract_variable_matrix(da, v)))
out <- list(
  target = target,
  stan = stan_version(), rstan = as.character(packageVersion("rstan")),
  chains = chains, warmup = warmup, draws = draws, seed = seed, cores = cores,
  wallSeconds = wall,
  chainSeconds = unname(rowSums(elapsed)),
  compileSeconds = compile_s,
  gradientEvaluations = leapfrogs,
  minEssBulk = min(ess),
  minEssBulkParameter = names(ess)[which.min(ess)],
  divergences = sum(sapply(sp, function(s) sum(s[, "divergent__"]))),
  stepSizes = sapply(sp, function(s) s[1, "stepsize__"])
)
cat(toJSON(out, auto_unbox = TRUE, digits = NA))
