// 100 independent normals with very different scales (Stan 2.21 syntax); the same target
// as Tributary's "scaled-gaussian" example model.
data {
  int<lower=1> N;
  vector<lower=0>[N] scales;
}
parameters {
  vector[N] x;
}
model {
  x ~ normal(0, scales);
}
