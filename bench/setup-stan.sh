#!/usr/bin/env bash
# Installs R with rstan (Stan 2.21), posterior and jsonlite from Debian's packages, for the
# side-by-side sampler benchmark (bench/sampler.ts --stan). Not part of CI: about a minute
# and 1.6 GB.
set -euo pipefail
SUDO=""
if [ "$(id -u)" -ne 0 ]; then SUDO="sudo"; fi
$SUDO apt-get update
DEBIAN_FRONTEND=noninteractive $SUDO apt-get install -y r-base-core r-cran-rstan r-cran-posterior r-cran-jsonlite
Rscript -e 'cat("rstan", as.character(packageVersion("rstan")), "posterior", as.character(packageVersion("posterior")), "\n")'
