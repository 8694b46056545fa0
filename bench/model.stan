// The portfolio model of the statistical specification, written independently of the
// TypeScript density for side-by-side checks (Stan 2.21, old array syntax). Every
// regressor is centred within its cell; cell effects are crossed and non-centred.
data {
  int<lower=1> G;                 // cells
  int<lower=1> C;                 // channels
  int<lower=1> B;                 // brands
  int<lower=1> M;                 // markets
  int<lower=0> J;                 // Fourier pairs
  int<lower=1> L;                 // maximum adstock lag
  int<lower=1> N;                 // all weeks of all cells
  int<lower=1> start[G];          // first row of each cell
  int<lower=2> len[G];            // weeks per cell
  int<lower=1, upper=B> brand[G];
  int<lower=1, upper=M> market[G];
  vector[N] y;
  matrix[N, C] x;                 // spend, >= 0
  vector[N] w;                    // absolute week: days since 1970-01-05 / 7
  vector<lower=0>[C] cac_lo;      // plausible CAC0 range, read as a 90 % interval
  vector<lower=0>[C] cac_hi;
}
transformed data {
  vector[G] ybar;
  vector[G] s;
  matrix[G, C] xbar;
  vector[N] trend;
  matrix[N, 2 * J] seas;
  vector[C] mu_m = -log(sqrt(cac_lo .* cac_hi));
  vector[C] mu_s = (log(cac_hi) - log(cac_lo)) / 3.29;
  for (g in 1:G) {
    int a = start[g];
    int T = len[g];
    int e = a + T - 1;
    ybar[g] = mean(y[a:e]);
    s[g] = sd(y[a:e]);
    if (s[g] == 0) s[g] = 1;
    for (c in 1:C) {
      real total = 0;
      int n = 0;
      for (t in a:e) {
        if (x[t, c] > 0) {
          total += x[t, c];
          n += 1;
        }
      }
      xbar[g, c] = n > 0 ? total / n : 1;
    }
    for (t in 1:T) trend[a + t - 1] = ((t - 1) - (T - 1) / 2.0) / 52;
    for (j in 1:J) {
      for (t in a:e) {
        seas[t, 2 * j - 1] = sin(2 * pi() * j * w[t] / 52.1775);
        seas[t, 2 * j] = cos(2 * pi() * j * w[t] / 52.1775);
      }
      seas[a:e, 2 * j - 1] = seas[a:e, 2 * j - 1] - mean(seas[a:e, 2 * j - 1]);
      seas[a:e, 2 * j] = seas[a:e, 2 * j] - mean(seas[a:e, 2 * j]);
    }
  }
}
parameters {
  vector[C] mu;
  vector<lower=0>[C] tauBrand;
  vector<lower=0>[C] tauMarket;
  vector<lower=0>[C] tauCell;
  vector<lower=0, upper=1>[C] alpha;
  vector<lower=0>[C] lambda;
  matrix[B, C] zB;
  matrix[M, C] zM;
  matrix[G, C] zG;
  vector[G] beta0;
  vector[G] beta1;
  matrix[G, J] gamma;
  matrix[G, J] delta;
  vector<lower=0>[G] sigma;
}
transformed parameters {
  matrix[G, C] logBeta;
  for (g in 1:G)
    for (c in 1:C)
      logBeta[g, c] = mu[c] + tauBrand[c] * zB[brand[g], c] + tauMarket[c] * zM[market[g], c] + tauCell[c] * zG[g, c];
}
model {
  vector[L] wts[C];
  for (c in 1:C) {
    for (l in 1:L) wts[c][l] = alpha[c] ^ (l - 1);
    wts[c] = wts[c] / sum(wts[c]);
  }
  mu ~ normal(mu_m, mu_s);
  tauBrand ~ normal(0, 0.5);
  tauMarket ~ normal(0, 0.5);
  tauCell ~ normal(0, 0.5);
  alpha ~ beta(2, 2);
  lambda ~ lognormal(log(2), 0.75);
  to_vector(zB) ~ std_normal();
  to_vector(zM) ~ std_normal();
  to_vector(zG) ~ std_normal();
  beta0 ~ normal(ybar, s);
  beta1 ~ normal(0, s);
  for (j in 1:J) {
    gamma[, j] ~ normal(0, s / 2);
    delta[, j] ~ normal(0, s / 2);
  }
  sigma ~ normal(0, s);
  for (g in 1:G) {
    int a = start[g];
    int T = len[g];
    int e = a + T - 1;
    vector[T] m = beta0[g] + beta1[g] * trend[a:e];
    for (j in 1:J) m = m + gamma[g, j] * seas[a:e, 2 * j - 1] + delta[g, j] * seas[a:e, 2 * j];
    for (c in 1:C) {
      if (max(x[a:e, c]) > 0) {
        real theta = lambda[c] * xbar[g, c];
        vector[T] r;
        for (t in 1:T) {
          real adstock = 0;
          for (l in 1:min(L, t)) adstock += wts[c][l] * x[a + t - l, c];
          r[t] = theta * (1 - exp(-adstock / theta));
        }
        m = m + exp(logBeta[g, c]) * (r - mean(r));
      }
    }
    y[a:e] ~ normal(m, sigma[g]);
  }
}
generated quantities {
  matrix[G, C] cac0 = exp(-logBeta);
}
