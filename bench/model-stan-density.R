#!/usr/bin/env Rscript
# Evaluates the log density of bench/model.stan (without the Jacobian of Stan's own
# constraining transforms) at given constrained parameter values, so that the TypeScript
# density can be checked against an independent implementation of the same model.
#
#   Rscript bench/model-stan-density.R DATA.json POINTS.json    → JSON array of log densities
suppressPackageStartupMessages({
  library(rstan)
  library(jsonlite)
})
rstan_options(boost_lib = "/usr/include")
args <- commandArgs(trailingOnly = TRUE)
self <- sub("^--file=", "", grep("^--file=", commandArgs(FALSE), value = TRUE))
here <- dirname(normalizePath(self))
data <- fromJSON(args[1])
points <- fromJSON(args[2], simplifyMatrix = TRUE)
cache <- Sys.getenv("TRIBUTARY_STAN_CACHE", tempdir())
source_file <- file.path(here, "model.stan")
rds <- file.path(cache, paste0("portfolio-model-", unname(tools::md5sum(source_file)), ".rds"))
if (file.exists(rds)) sm <- readRDS(rds) else {
  sm <- stan_model(source_file, model_name = "portfolio_model")
  saveRDS(sm, rds)
}
fit <- sampling(sm, data = data, chains = 0)
lp <- sapply(seq_len(nrow(points$mu)), function(i) {
  pars <- list(
    mu = points$mu[i, ], tauBrand = points$tauBrand[i, ], tauMarket = points$tauMarket[i, ], tauCell = points$tauCell[i, ],
    alpha = points$alpha[i, ], lambda = points$lambda[i, ],
    zB = matrix(points$zB[i, ], nrow = data$B, byrow = TRUE),
    zM = matrix(points$zM[i, ], nrow = data$M, byrow = TRUE),
    zG = matrix(points$zG[i, ], nrow = data$G, byrow = TRUE),
    beta0 = points$beta0[i, ], beta1 = points$beta1[i, ],
    gamma = matrix(points$gamma[i, ], nrow = data$G, byrow = TRUE),
    delta = matrix(points$delta[i, ], nrow = data$G, byrow = TRUE),
    sigma = points$sigma[i, ]
  )
  log_prob(fit, unconstrain_pars(fit, pars), adjust_transform = FALSE)
})
cat(toJSON(lp, digits = NA))
