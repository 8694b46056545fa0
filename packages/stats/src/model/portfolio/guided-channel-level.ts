/**
 * The top of the guided pooling map (see ParameterLayout): per channel, the channel effect μ
 * and the brand deviations δB are built together from the sampler's coordinates u as
 *   x = (μ − m0, δB) = Λ⁻¹h + L⁻ᵀu,  Λ = L·Lᵀ,
 * where N(Λ⁻¹h, Λ⁻¹) is the exact conditional of x given τB, τM, τG when each guided cell's
 * data say log β ~ Normal(m̂, ŝ) and the market and cell deviations are integrated out.
 * With z_g the units a cell loads on (μ, and its brand when the brand level is on):
 *   Λ = diag(1/s0², I/τB²) + Σ_g w_g z_g z_gᵀ − Σ_m A_m A_mᵀ / c_m,
 *   h = Σ_g w_g r_g z_g − Σ_m A_m R_m / c_m,
 * with w_g = 1/(τG² + ŝ_g²), r_g = m̂_g − m0, A_m = Σ_{g∈m} w_g z_g, c_m = 1/τM² + Σ_{g∈m} w_g,
 * R_m = Σ_{g∈m} w_g r_g (Sherman–Morrison per market; without a market level the sums over
 * m vanish). Unguided cells (ŝ = ∞) have w_g = 0, so without any guide the map is
 * μ = m0 + s0·u, δB = τB·u, exactly the non-centred form of model.md.
 *
 * Building μ in the same block matters: given small τ's the data pin μ down far more
 * tightly than given large ones, a funnel between μ and the τ's that a map guiding only
 * the deviations leaves to the sampler.
 *
 * The map is affine in u given the τ's, with log-Jacobian −Σ log L_ii; with the priors
 * μ ~ Normal(m0, s0) and δB/τB ~ Normal(0, 1) this is the term `build` returns (up to a
 * constant, chosen so that it equals −½|u|² without a guide). Matrices are small
 * ((1 + brands)² per channel); their buffers are allocated once.
 */
export class GuidedChannelLevel {
  private readonly n: number;
  private readonly B: number;
  private readonly M: number;
  private readonly C: number;
  private readonly G: number;
  private readonly cellBrand: Int32Array | readonly number[];
  private readonly cellMarket: Int32Array | readonly number[];
  private readonly brandOn: boolean;
  private readonly marketOn: boolean;
  // per channel, kept from `build` for `backprop`
  private readonly lower: Float64Array; // C·n·n, the Cholesky factor L of Λ
  private readonly mean: Float64Array; // C·n, Λ⁻¹h
  private readonly offset: Float64Array; // C·n, L⁻ᵀu
  private readonly value: Float64Array; // C·n, x
  private readonly weightA: Float64Array; // C·M·n, A_m
  private readonly marketC: Float64Array; // C·M, c_m
  private readonly marketR: Float64Array; // C·M, R_m
  // scratch
  private readonly lambda: Float64Array; // n·n
  private readonly h: Float64Array;
  private readonly a: Float64Array;
  private readonly hBar: Float64Array;
  private readonly lBar: Float64Array; // n·n
  private readonly work: Float64Array; // n·n
  private readonly gSym: Float64Array; // n·n
  private readonly aBar: Float64Array; // M·n
  private readonly cBar: Float64Array; // M
  private readonly rBar: Float64Array; // M

  constructor(
    brandCount: number,
    marketCount: number,
    channelCount: number,
    cellBrand: Int32Array | readonly number[],
    cellMarket: Int32Array | readonly number[],
    brandOn: boolean,
    marketOn: boolean,
  ) {
    const B = brandOn ? brandCount : 0;
    const M = marketCount;
    const C = channelCount;
    const n = 1 + B;
    this.n = n;
    this.B = B;
    this.M = M;
    this.C = C;
    this.G = cellBrand.length;
    this.cellBrand = cellBrand;
    this.cellMarket = cellMarket;
    this.brandOn = brandOn;
    this.marketOn = marketOn;
    this.lower = new Float64Array(C * n * n);
    this.mean = new Float64Array(C * n);
    this.offset = new Float64Array(C * n);
    this.value = new Float64Array(C * n);
    this.weightA = new Float64Array(C * M * n);
    this.marketC = new Float64Array(C * M);
    this.marketR = new Float64Array(C * M);
    this.lambda = new Float64Array(n * n);
    this.h = new Float64Array(n);
    this.a = new Float64Array(n);
    this.hBar = new Float64Array(n);
    this.lBar = new Float64Array(n * n);
    this.work = new Float64Array(n * n);
    this.gSym = new Float64Array(n * n);
    this.aBar = new Float64Array(M * n);
    this.cBar = new Float64Array(M);
    this.rBar = new Float64Array(M);
  }

  /**
   * Builds μ of channel c (written to mu[c]) from u = q[muAt + c] and δB (written to
   * delta[b·C + c]) from u = q[zAt + b·C + c]; returns log N(μ | m0, s0) + log N(δB/τB | 0, I)
   * − B·log τB − Σ log L_ii up to a constant.
   */
  build(
    c: number,
    m0: number,
    s0: number,
    tauB: number,
    tauM: number,
    tauG: number,
    guideMean: Float64Array,
    guidePrecision: Float64Array,
    q: Float64Array,
    muAt: number,
    zAt: number,
    mu: Float64Array,
    delta: Float64Array,
  ): number {
    const { n, B, M, C, G } = this;
    const lam = this.lambda;
    const h = this.h;
    const A = this.weightA;
    const aOff = c * M * n;
    const tauG2 = tauG * tauG;
    const invTauB2 = this.brandOn ? 1 / (tauB * tauB) : 0;
    const invS02 = 1 / (s0 * s0);
    lam.fill(0);
    h.fill(0);
    lam[0] = invS02;
    for (let b = 1; b < n; b++) lam[b * n + b] = invTauB2;
    if (this.marketOn) {
      A.fill(0, aOff, aOff + M * n);
      const invTauM2 = 1 / (tauM * tauM);
      for (let m = 0; m < M; m++) {
        this.marketC[c * M + m] = invTauM2;
        this.marketR[c * M + m] = 0;
      }
    }
    for (let g = 0; g < G; g++) {
      const prec = guidePrecision[g * C + c]!;
      if (prec === 0) continue;
      const w = prec / (1 + prec * tauG2);
      const r = guideMean[g * C + c]! - m0;
      lam[0] = lam[0]! + w;
      h[0] = h[0]! + w * r;
      if (this.brandOn) {
        const b = 1 + this.cellBrand[g]!;
        lam[b * n + b] = lam[b * n + b]! + w;
        lam[b * n] = lam[b * n]! + w;
        lam[b] = lam[b]! + w;
        h[b] = h[b]! + w * r;
      }
      if (this.marketOn) {
        const m = this.cellMarket[g]!;
        const row = aOff + m * n;
        A[row] = A[row]! + w;
        if (this.brandOn) A[row + 1 + this.cellBrand[g]!] = A[row + 1 + this.cellBrand[g]!]! + w;
        this.marketC[c * M + m] = this.marketC[c * M + m]! + w;
        this.marketR[c * M + m] = this.marketR[c * M + m]! + w * r;
      }
    }
    if (this.marketOn) {
      for (let m = 0; m < M; m++) {
        const cm = this.marketC[c * M + m]!;
        const rm = this.marketR[c * M + m]!;
        const row = aOff + m * n;
        for (let i = 0; i < n; i++) {
          const ai = A[row + i]!;
          if (ai === 0) continue;
          h[i] = h[i]! - (ai * rm) / cm;
          for (let j = 0; j < n; j++) lam[i * n + j] = lam[i * n + j]! - (ai * A[row + j]!) / cm;
        }
      }
    }
    // Cholesky Λ = L·Lᵀ
    const L = this.lower;
    const lOff = c * n * n;
    let logDetL = 0;
    for (let i = 0; i < n; i++) {
      for (let j = 0; j <= i; j++) {
        let s = lam[i * n + j]!;
        for (let k = 0; k < j; k++) s -= L[lOff + i * n + k]! * L[lOff + j * n + k]!;
        if (i === j) {
          const d = Math.sqrt(s);
          L[lOff + i * n + i] = d;
          logDetL += Math.log(d);
        } else L[lOff + i * n + j] = s / L[lOff + j * n + j]!;
      }
      for (let j = i + 1; j < n; j++) L[lOff + i * n + j] = 0;
    }
    // mean = Λ⁻¹h, offset = L⁻ᵀu
    const mean = this.mean;
    const off = this.offset;
    const x = this.value;
    const vOff = c * n;
    forwardSolve(L, lOff, n, h, 0, this.a);
    backwardSolve(L, lOff, n, this.a, 0, mean, vOff);
    this.a[0] = q[muAt + c]!;
    for (let b = 0; b < B; b++) this.a[1 + b] = q[zAt + b * C + c]!;
    backwardSolve(L, lOff, n, this.a, 0, off, vOff);
    let sumSq = 0;
    for (let i = 0; i < n; i++) x[vOff + i] = mean[vOff + i]! + off[vOff + i]!;
    mu[c] = m0 + x[vOff]!;
    for (let b = 0; b < B; b++) {
      const d = x[vOff + 1 + b]!;
      delta[b * C + c] = d;
      sumSq += d * d;
    }
    const x0 = x[vOff]!;
    return -0.5 * x0 * x0 * invS02 - 0.5 * sumSq * invTauB2 - (B > 0 ? B * Math.log(tauB) : 0) - logDetL - Math.log(s0);
  }

  /**
   * Reverse pass of `build` for channel c: `gradMu` is ∂(rest of log p)/∂μ and
   * `gradDelta[b·C + c]` holds ∂(rest of log p)/∂δB. Adds ∂/∂u to grad[muAt + c] and
   * grad[zAt + b·C + c] and writes [∂/∂log τB, ∂/∂log τM, ∂/∂log τG] of the whole term (its
   * own priors and Jacobian included) into `out`; adds ∂/∂m̂_g to guideMeanGrad[g·C + c].
   */
  backprop(
    c: number,
    m0: number,
    s0: number,
    tauB: number,
    tauM: number,
    tauG: number,
    guideMean: Float64Array,
    guidePrecision: Float64Array,
    gradMu: number,
    gradDelta: Float64Array,
    muAt: number,
    zAt: number,
    grad: Float64Array,
    out: Float64Array,
    guideMeanGrad: Float64Array,
  ): void {
    const { n, B, M, C, G } = this;
    const L = this.lower;
    const lOff = c * n * n;
    const vOff = c * n;
    const x = this.value;
    const invTauB2 = this.brandOn ? 1 / (tauB * tauB) : 0;
    const t = this.h; // reuse: total derivative with respect to x
    t[0] = gradMu - x[vOff]! / (s0 * s0);
    let dTauB = -B / tauB;
    for (let b = 0; b < B; b++) {
      const d = x[vOff + 1 + b]!;
      t[1 + b] = gradDelta[b * C + c]! - d * invTauB2;
      dTauB += (d * d * invTauB2) / tauB;
    }
    // u: ∂x/∂u = L⁻ᵀ, so ∂/∂u = L⁻¹t
    const a = this.a;
    forwardSolve(L, lOff, n, t, 0, a);
    grad[muAt + c] = grad[muAt + c]! + a[0]!;
    for (let b = 0; b < B; b++) grad[zAt + b * C + c] = grad[zAt + b * C + c]! + a[1 + b]!;
    // mean = Λ⁻¹h: h̄ = Λ⁻¹t = L⁻ᵀa, Λ̄ = −h̄·meanᵀ (symmetrised)
    const hBar = this.hBar;
    backwardSolve(L, lOff, n, a, 0, hBar, 0);
    const gs = this.gSym;
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) gs[i * n + j] = -0.5 * (hBar[i]! * this.mean[vOff + j]! + this.mean[vOff + i]! * hBar[j]!);
    }
    // offset = L⁻ᵀu: L̄_ji = −offset_j·a_i (j ≥ i); log-Jacobian −Σ log L_ii: L̄_ii −= 1/L_ii
    const lBar = this.lBar;
    for (let j = 0; j < n; j++) {
      for (let i = 0; i < n; i++) lBar[j * n + i] = i <= j ? -this.offset[vOff + j]! * a[i]! : 0;
      lBar[j * n + j] = lBar[j * n + j]! - 1 / L[lOff + j * n + j]!;
    }
    // Cholesky adjoint: Λ̄ = L⁻ᵀ Φ(Lᵀ L̄) L⁻¹, Φ = lower triangle with halved diagonal
    // (Murray 2016, "Differentiation of the Cholesky decomposition", arXiv:1602.07527, eq. 10)
    const w = this.work;
    for (let i = 0; i < n; i++) {
      for (let j = 0; j <= i; j++) {
        let s = 0;
        for (let k = i; k < n; k++) s += L[lOff + k * n + i]! * lBar[k * n + j]!;
        w[i * n + j] = i === j ? 0.5 * s : s;
      }
      for (let j = i + 1; j < n; j++) w[i * n + j] = 0;
    }
    // W ← L⁻ᵀ W: solve Lᵀ X = W column by column; then X ← X L⁻¹: solve Lᵀ Yᵀ = Xᵀ row by row
    for (let col = 0; col < n; col++) {
      for (let i = n - 1; i >= 0; i--) {
        let s = w[i * n + col]!;
        for (let k = i + 1; k < n; k++) s -= L[lOff + k * n + i]! * w[k * n + col]!;
        w[i * n + col] = s / L[lOff + i * n + i]!;
      }
    }
    for (let row = 0; row < n; row++) {
      for (let j = n - 1; j >= 0; j--) {
        let s = w[row * n + j]!;
        for (let k = j + 1; k < n; k++) s -= w[row * n + k]! * L[lOff + k * n + j]!;
        w[row * n + j] = s / L[lOff + j * n + j]!;
      }
    }
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) gs[i * n + j] = gs[i * n + j]! + 0.5 * (w[i * n + j]! + w[j * n + i]!);

    // Λ = diag(1/s0², I/τB²) + Σ w z zᵀ − Σ_m A_m A_mᵀ/c_m and h = Σ w r z − Σ_m A_m R_m/c_m, back to w_g, r_g, τ
    for (let b = 1; b < n; b++) dTauB += gs[b * n + b]! * ((-2 * invTauB2) / tauB);
    let dTauM = 0;
    if (this.marketOn) {
      const A = this.weightA;
      const aOff = c * M * n;
      for (let m = 0; m < M; m++) {
        const cm = this.marketC[c * M + m]!;
        const rm = this.marketR[c * M + m]!;
        const row = aOff + m * n;
        let quad = 0;
        let hA = 0;
        for (let i = 0; i < n; i++) {
          let ga = 0;
          for (let j = 0; j < n; j++) ga += gs[i * n + j]! * A[row + j]!;
          quad += A[row + i]! * ga;
          hA += hBar[i]! * A[row + i]!;
          this.aBar[m * n + i] = (-2 * ga - hBar[i]! * rm) / cm;
        }
        const cBar = (quad + hA * rm) / (cm * cm);
        this.cBar[m] = cBar;
        this.rBar[m] = -hA / cm;
        dTauM += cBar * (-2 / (tauM * tauM * tauM));
      }
    }
    const tauG2 = tauG * tauG;
    let dTauG = 0;
    for (let g = 0; g < G; g++) {
      const prec = guidePrecision[g * C + c]!;
      if (prec === 0) continue;
      const wg = prec / (1 + prec * tauG2);
      const r = guideMean[g * C + c]! - m0;
      // z_g·Λ̄·z_g and z_g·h̄ over the cell's units (μ, and its brand)
      let zGz = gs[0]!;
      let zh = hBar[0]!;
      const b = this.brandOn ? 1 + this.cellBrand[g]! : -1;
      if (b > 0) {
        zGz += 2 * gs[b]! + gs[b * n + b]!;
        zh += hBar[b]!;
      }
      let wBar = zGz + zh * r;
      let rBar = zh * wg;
      if (this.marketOn) {
        const m = this.cellMarket[g]!;
        let aSum = this.aBar[m * n]!;
        if (b > 0) aSum += this.aBar[m * n + b]!;
        wBar += aSum + this.cBar[m]! + this.rBar[m]! * r;
        rBar += this.rBar[m]! * wg;
      }
      guideMeanGrad[g * C + c] = guideMeanGrad[g * C + c]! + rBar;
      dTauG += wBar * (-2 * tauG * wg * wg);
    }
    out[0] = dTauB * tauB;
    out[1] = dTauM * tauM;
    out[2] = dTauG * tauG;
  }
}

/** Solves L·x = b for lower-triangular L (n × n at lOff), b at bOff, x written at xOff. */
function forwardSolve(L: Float64Array, lOff: number, n: number, b: Float64Array, bOff: number, x: Float64Array, xOff = 0): void {
  for (let i = 0; i < n; i++) {
    let s = b[bOff + i]!;
    for (let k = 0; k < i; k++) s -= L[lOff + i * n + k]! * x[xOff + k]!;
    x[xOff + i] = s / L[lOff + i * n + i]!;
  }
}

/** Solves Lᵀ·x = b for lower-triangular L (n × n at lOff), b at bOff, x written at xOff. */
function backwardSolve(L: Float64Array, lOff: number, n: number, b: Float64Array, bOff: number, x: Float64Array, xOff = 0): void {
  for (let i = n - 1; i >= 0; i--) {
    let s = b[bOff + i]!;
    for (let k = i + 1; k < n; k++) s -= L[lOff + k * n + i]! * x[xOff + k]!;
    x[xOff + i] = s / L[lOff + i * n + i]!;
  }
}
