import type { PortfolioData } from "../../src/data/portfolio-data";
import { absoluteWeekOf } from "../../src/model/absolute-week";
import { logGamma } from "../../src/model/special-functions";
import type { PortfolioDensity } from "../../src/model/portfolio/portfolio-density";
import type { LiftTest } from "../../src/model/portfolio/portfolio-options";

/**
 * The model of model.md written out literally (direct adstock sums, densities with their
 * constants, no reparameterisation), in constrained parameters, for comparison with the
 * fast density. Returns the log posterior density of the named parameters plus the
 * log-Jacobian of the sampler's unconstrained map, so that differences between two
 * points must equal those of the fast density.
 */
export function referenceLogDensity(model: PortfolioDensity, data: PortfolioData, q: Float64Array, liftTests: readonly LiftTest[] = []): number {
  const out = new Float64Array(model.constrainedNames.length);
  model.constrain(q, out);
  const value = (name: string): number => {
    const i = model.constrainedNames.indexOf(name);
    if (i < 0) throw new Error(`missing ${name}`);
    return out[i]!;
  };
  const lay = model.layout;
  const opts = model.options;
  const pooled = lay.structure === "pooled";
  const off = model.cellIndexOffset;
  const L = opts.maxLag;
  const J = opts.seasonalityOrder;
  const channels = data.channels;
  const C = channels.length;
  const logNormal = (x: number, m: number, s: number): number => -0.5 * ((x - m) / s) ** 2 - Math.log(s) - 0.5 * Math.log(2 * Math.PI);
  const logHalfNormal = (x: number, s: number): number => Math.log(2) + logNormal(x, 0, s);
  let lp = 0;
  let jac = 0;
  const brands = [...new Set(data.cells.map((c) => c.brand))];
  const markets = [...new Set(data.cells.map((c) => c.market))];
  const alphaOf = (g: number, ch: string): number => value(pooled ? `alpha[${ch}]` : `alpha[${g + off},${ch}]`);
  const lambdaOf = (g: number, ch: string): number => value(pooled ? `lambda[${ch}]` : `lambda[${g + off},${ch}]`);
  const shapeOf = (g: number, ch: string): number => value(pooled ? `hillShape[${ch}]` : `hillShape[${g + off},${ch}]`);
  channels.forEach((ch, c) => {
    const [lo, hi] = opts.cacRange[c]!;
    const m0 = -Math.log(Math.sqrt(lo * hi));
    const s0 = (Math.log(hi) - Math.log(lo)) / 3.29;
    if (pooled) {
      lp += logNormal(value(`mu[${ch}]`), m0, s0);
      for (const level of ["tauBrand", "tauMarket", "tauCell"]) {
        const name = `${level}[${ch}]`;
        if (model.constrainedNames.includes(name)) {
          const tau = value(name);
          lp += logHalfNormal(tau, 0.5);
          jac += Math.log(tau);
        }
      }
    }
    const perCell = pooled ? [0] : data.cells.map((_, g) => g);
    for (const g of perCell) {
      if (!pooled) lp += logNormal(value(`eta[${g + off},${ch}]`), m0, s0);
      const a = alphaOf(g, ch);
      lp += Math.log(6 * a * (1 - a)); // Beta(2,2) density 6 a (1 − a)
      jac += Math.log(a * (1 - a));
      const lambda = lambdaOf(g, ch);
      lp += logNormal(Math.log(lambda), Math.log(2), 0.75) - Math.log(lambda);
      jac += Math.log(lambda);
      if (opts.saturation === "hill") {
        const k = shapeOf(g, ch);
        lp += logNormal(Math.log(k), 0, 0.5) - Math.log(k);
        jac += Math.log(k);
      }
    }
  });
  if (pooled) {
    // μ and zB = brand deviation / τB are built together: the sampler's coordinates map to
    // x = (μ − m0, δB) through x = Λ⁻¹h + chol(Λ)⁻ᵀu with Λ = diag(1/s0², I/τB²) + Zᵀ Σ⁻¹ Z,
    // where Σ is the covariance of the guided cells' estimates given μ and the brand
    // deviations (τM² shared within a market, τG² + ŝ² per cell) and Z picks each cell's
    // units (μ, and its brand when the brand level is on):
    // log-Jacobian −½ log det Λ − B log τB (− log s0, a constant).
    channels.forEach((ch, c) => {
      const brandOn = model.constrainedNames.includes(`tauBrand[${ch}]`);
      const tauB = brandOn ? value(`tauBrand[${ch}]`) : 0;
      const tauG = value(`tauCell[${ch}]`);
      const tauM = model.constrainedNames.includes(`tauMarket[${ch}]`) ? value(`tauMarket[${ch}]`) : 0;
      const [lo, hi] = opts.cacRange[c]!;
      const s0 = (Math.log(hi) - Math.log(lo)) / 3.29;
      if (brandOn) brands.forEach((_, b) => (lp += logNormal(value(`brandDeviation[${b},${ch}]`) / tauB, 0, 1)));
      const units = brandOn ? ["mu", ...brands] : ["mu"];
      const loads = (cell: { brand: string }, unit: string): boolean => unit === "mu" || unit === cell.brand;
      const guided = data.cells.flatMap((cell, g) => (lay.guidePrecision[g * C + c]! > 0 ? [{ g, cell }] : []));
      const sigma = guided.map(({ g, cell }) =>
        guided.map(({ g: h, cell: other }) => (cell.market === other.market ? tauM * tauM : 0) + (g === h ? tauG * tauG + 1 / lay.guidePrecision[g * C + c]! : 0)),
      );
      const sigmaInverse = guided.length > 0 ? invertMatrix(sigma) : [];
      const precision = units.map((unit, i) =>
        units.map((other, j) => {
          let sum = i !== j ? 0 : unit === "mu" ? 1 / (s0 * s0) : 1 / (tauB * tauB);
          guided.forEach((x, a) => guided.forEach((y, b) => {
            if (loads(x.cell, unit) && loads(y.cell, other)) sum += sigmaInverse[a]![b]!;
          }));
          return sum;
        }),
      );
      jac += -0.5 * logDeterminant(precision) - (brandOn ? brands.length * Math.log(tauB) : 0);
    });
    // zM = market deviation / τM, built given the brand deviations through δ = v·S + √v·u with
    // v = 1/(1/τM² + P), P = Σ over the market's guided cells of 1/(τG² + ŝ²): log-Jacobian log √v − log τM
    channels.forEach((ch, c) => {
      if (!model.constrainedNames.includes(`tauMarket[${ch}]`)) return;
      const tau = value(`tauMarket[${ch}]`);
      const tauG = value(`tauCell[${ch}]`);
      markets.forEach((market, j) => {
        lp += logNormal(value(`marketDeviation[${j},${ch}]`) / tau, 0, 1);
        let P = 0;
        data.cells.forEach((cell, g) => {
          const prec = lay.guidePrecision[g * C + c]!;
          if (cell.market === market && prec > 0) P += 1 / (tauG * tauG + 1 / prec);
        });
        jac += 0.5 * Math.log(1 / (1 / (tau * tau) + P)) - Math.log(tau);
      });
    });
    // zG = cell deviation / τG; the sampler's guided coordinate u maps to
    // zG = (m + √v·u − group)/τG, with log-Jacobian log √v − log τG
    data.cells.forEach((_, g) => {
      channels.forEach((ch, c) => {
        const tau = value(`tauCell[${ch}]`);
        const zG = value(`cellDeviation[${g},${ch}]`) / tau;
        lp += logNormal(zG, 0, 1);
        const v = 1 / (1 / (tau * tau) + lay.guidePrecision[g * C + c]!);
        jac += 0.5 * Math.log(v) - Math.log(tau);
      });
    });
  }
  const nu = opts.likelihood === "student-t" ? value(pooled ? "nu" : `nu[${off}]`) : 0;
  if (opts.likelihood === "student-t") {
    lp += Math.log(nu) - 0.1 * nu + 2 * Math.log(0.1) - logGamma(2); // Gamma(2, rate 0.1)
    jac += Math.log(nu);
  }
  const responseOf = (a: number, theta: number, k: number): number =>
    opts.saturation === "exponential" ? theta * (1 - Math.exp(-a / theta)) : a <= 0 ? 0 : (theta * a ** k) / (a ** k + theta ** k);
  const adstockAt = (x: Float64Array, t: number, alpha: number, zeroFrom = Infinity, zeroTo = -Infinity): number => {
    let num = 0;
    let den = 0;
    for (let l = 0; l < L; l++) {
      den += alpha ** l;
      const s = t - l;
      if (s >= 0 && !(s >= zeroFrom && s <= zeroTo)) num += alpha ** l * x[s]!;
    }
    return num / den;
  };
  data.cells.forEach((cell, g) => {
    const T = cell.outcome.length;
    const train = T - opts.holdoutWeeks;
    const y = cell.outcome.subarray(0, train);
    const ybar = y.reduce((a, b) => a + b, 0) / train;
    const sd = Math.sqrt(y.reduce((a, b) => a + (b - ybar) ** 2, 0) / (train - 1));
    const fixed = opts.baselinePriorScale;
    const s = fixed ? fixed.scale[g]! : sd > 0 ? sd : 1;
    const centre = fixed ? fixed.centre[g]! : ybar;
    const G = g + off;
    const beta0 = value(`beta0[${G}]`);
    const beta1 = value(`beta1[${G}]`);
    const sigma = value(`sigma[${G}]`);
    lp += logNormal(beta0, centre, s) + logNormal(beta1, 0, s) + logHalfNormal(sigma, s);
    jac += Math.log(sigma);
    const w0 = absoluteWeekOf(cell.firstWeek);
    const mean = new Float64Array(train);
    for (let t = 0; t < train; t++) mean[t] = beta0 + (beta1 * (t - (train - 1) / 2)) / 52;
    for (let j = 1; j <= J; j++) {
      const gamma = value(`gamma[${G},${j}]`);
      const delta = value(`delta[${G},${j}]`);
      lp += logNormal(gamma, 0, s / 2) + logNormal(delta, 0, s / 2);
      const sin = Array.from({ length: train }, (_, t) => Math.sin((2 * Math.PI * j * (w0 + t)) / 52.1775));
      const cos = Array.from({ length: train }, (_, t) => Math.cos((2 * Math.PI * j * (w0 + t)) / 52.1775));
      const sm = sin.reduce((a, b) => a + b, 0) / train;
      const cm = cos.reduce((a, b) => a + b, 0) / train;
      for (let t = 0; t < train; t++) mean[t] = mean[t]! + gamma * (sin[t]! - sm) + delta * (cos[t]! - cm);
    }
    data.controls.forEach((name, k) => {
      const coef = value(`controlCoef[${G},${name}]`);
      lp += logNormal(coef, 0, s);
      const x = cell.controls[k]!.subarray(0, train);
      const xm = x.reduce((a, b) => a + b, 0) / train;
      const xs = Math.sqrt(x.reduce((a, b) => a + (b - xm) ** 2, 0) / (train - 1)) || 1;
      for (let t = 0; t < train; t++) mean[t] = mean[t]! + (coef * (x[t]! - xm)) / xs;
    });
    channels.forEach((ch, c) => {
      const x = cell.spend[c]!;
      const positive = Array.from(x.subarray(0, train)).filter((v) => v > 0);
      const xbar = positive.length > 0 ? positive.reduce((a, b) => a + b, 0) / positive.length : 1;
      const theta = lambdaOf(g, ch) * xbar;
      const beta = value(`beta[${G},${ch}]`);
      const alpha = alphaOf(g, ch);
      const k = opts.saturation === "hill" ? shapeOf(g, ch) : 1;
      const r = Array.from({ length: train }, (_, t) => responseOf(adstockAt(x, t, alpha), theta, k));
      const rm = r.reduce((a, b) => a + b, 0) / train;
      for (let t = 0; t < train; t++) mean[t] = mean[t]! + beta * (r[t]! - rm);
    });
    for (let t = 0; t < train; t++) {
      const e = y[t]! - mean[t]!;
      if (opts.likelihood === "normal") lp += logNormal(y[t]!, mean[t]!, sigma);
      else {
        const z = e / sigma;
        lp += logGamma((nu + 1) / 2) - logGamma(nu / 2) - 0.5 * Math.log(nu * Math.PI) - Math.log(sigma) - ((nu + 1) / 2) * Math.log(1 + (z * z) / nu);
      }
    }
    for (const test of liftTests) {
      if (test.brand !== cell.brand || test.market !== cell.market) continue;
      const c = channels.indexOf(test.channel);
      const ch = test.channel;
      const x = cell.spend[c]!;
      const positive = Array.from(x.subarray(0, train)).filter((v) => v > 0);
      const xbar = positive.length > 0 ? positive.reduce((a, b) => a + b, 0) / positive.length : 1;
      const theta = lambdaOf(g, ch) * xbar;
      const alpha = alphaOf(g, ch);
      const k = opts.saturation === "hill" ? shapeOf(g, ch) : 1;
      const t1 = absoluteWeekOf(test.firstWeek) - w0;
      const t2 = absoluteWeekOf(test.lastWeek) - w0;
      let implied = 0;
      for (let t = t1; t <= t2; t++) {
        implied += responseOf(adstockAt(x, t, alpha), theta, k) - responseOf(adstockAt(x, t, alpha, t1, t2), theta, k);
      }
      implied *= value(`beta[${G},${ch}]`);
      lp += logNormal(test.incrementalOutcome, implied, test.standardError);
    }
  });
  return lp + jac;
}

/** Inverse of a small matrix by Gauss–Jordan elimination with partial pivoting (shared by the model tests). */
export function invertMatrix(a: number[][]): number[][] {
  const n = a.length;
  const m = a.map((row, i) => [...row, ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))]);
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(m[r]![col]!) > Math.abs(m[pivot]![col]!)) pivot = r;
    [m[col], m[pivot]] = [m[pivot]!, m[col]!];
    const p = m[col]![col]!;
    for (let j = 0; j < 2 * n; j++) m[col]![j] = m[col]![j]! / p;
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const f = m[r]![col]!;
      for (let j = 0; j < 2 * n; j++) m[r]![j] = m[r]![j]! - f * m[col]![j]!;
    }
  }
  return m.map((row) => row.slice(n));
}

/** log |det a| of a small matrix by Gaussian elimination with partial pivoting. */
function logDeterminant(a: number[][]): number {
  const m = a.map((row) => [...row]);
  const n = m.length;
  let sum = 0;
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(m[r]![col]!) > Math.abs(m[pivot]![col]!)) pivot = r;
    [m[col], m[pivot]] = [m[pivot]!, m[col]!];
    const p = m[col]![col]!;
    sum += Math.log(Math.abs(p));
    for (let r = col + 1; r < n; r++) {
      const f = m[r]![col]! / p;
      for (let j = col; j < n; j++) m[r]![j] = m[r]![j]! - f * m[col]![j]!;
    }
  }
  return sum;
}
