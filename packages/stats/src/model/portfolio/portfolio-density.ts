import type { DensityModel } from "../density-model";
import type { RandomSource } from "../../rng/random-source";
import { adstockEmptiedWeeks, adstockSumsUnchecked, adstockWeightSum, adstockWeightSumDerivative } from "../adstock";
import { digamma, logGamma } from "../special-functions";
import { saturationHillWithDerivatives } from "../saturation";
import { betaPriorOnLogit, gammaPriorOnLog, halfNormalPriorOnLog, logistic } from "../priors";
import type { PortfolioConstants } from "./portfolio-constants";
import type { ParameterLayout } from "./parameter-layout";
import type { ResolvedPortfolioOptions } from "./portfolio-options";
import { GuidedChannelLevel } from "./guided-channel-level";
import { addColumnDots, addColumns, exponentialSaturation, hillSaturation, lineAndColumnDotsThenCentre, setLineAndColumns } from "./density-kernels";
import { portfolioParameterNames } from "./portfolio-names";

const LOG_TWO = Math.LN2;
const LAMBDA_PRIOR_SD = 0.75;
const HILL_SHAPE_PRIOR_SD = 0.5;
const TAU_PRIOR_SCALE = 0.5;

/**
 * The log posterior density of the portfolio model (model.md) on the unconstrained
 * vector, with its hand-derived gradient. All buffers are allocated here, once; an
 * evaluation allocates nothing. Per evaluation each cell × channel takes a pass over its
 * training weeks for the adstock sums (with their α-derivative) and one for the saturation;
 * a cell's media then enter its mean as columns beside the baseline, and the gradient reads
 * them back in one pass per cell × channel (loops in density-kernels). The exponential
 * form takes one exponential per cell × channel × training week.
 */
export class PortfolioDensity implements DensityModel {
  readonly dimension: number;
  readonly constrainedNames: readonly string[];
  readonly constants: PortfolioConstants;
  readonly options: ResolvedPortfolioOptions;
  readonly layout: ParameterLayout;
  /** Offset added to cell indices in parameter names (the unpooled per-cell models use their global index). */
  readonly cellIndexOffset: number;

  // parameter values, per evaluation
  private readonly mu: Float64Array;
  private readonly tauBrand: Float64Array;
  private readonly tauMarket: Float64Array;
  private readonly tauCell: Float64Array;
  private readonly alpha: Float64Array;
  private readonly lambda: Float64Array;
  private readonly hillShape: Float64Array;
  private readonly beta: Float64Array;
  private readonly theta: Float64Array;
  private readonly gradLogBeta: Float64Array;
  private readonly gradAlpha: Float64Array;
  private readonly gradLogTheta: Float64Array;
  private readonly gradLogShape: Float64Array;
  private readonly mediaMean: Float64Array;
  private readonly logBetaGroup: Float64Array;
  /** Per cell × channel: v and m of the guided cell level (see ParameterLayout.guideMean). */
  private readonly cellV: Float64Array;
  private readonly cellM: Float64Array;
  /** Whether the guide's means move with α and λ; the means at the current position and their gradient. */
  private readonly guideTracks: boolean;
  private readonly guideMeanNow: Float64Array;
  private readonly guideMeanGrad: Float64Array;
  private readonly guideShiftAlpha: Float64Array;
  private readonly guideShiftLambda: Float64Array;
  /** Brand and market deviations δ with their guide terms v, S, P and gradient buffers (per level unit × channel). */
  private readonly deltaBrand: Float64Array;
  /** μ and the brand deviations, built jointly (pooled structure only). */
  private readonly channelLevel: GuidedChannelLevel;
  /** [∂/∂log τB, ∂/∂log τM, ∂/∂log τG] of the channel level, per channel. */
  private readonly channelLevelGradient = new Float64Array(3);
  private readonly gradDeltaBrand: Float64Array;
  private readonly deltaMarket: Float64Array;
  private readonly marketV: Float64Array;
  private readonly marketS: Float64Array;
  private readonly marketP: Float64Array;
  private readonly gradDeltaMarket: Float64Array;
  /** Per cell × channel from emptiedStart: the training weeks where the adstock window has just emptied, then −1. */
  private readonly emptiedWeeks: Int32Array;
  private readonly emptiedStart: Int32Array;
  /** Per channel, from α (W = Σ_{l<L} α^l): 1/W, W′/W² and W′/W. */
  private readonly adstockInvWeight: Float64Array;
  private readonly adstockDScale: Float64Array;
  private readonly adstockWeightRatio: Float64Array;
  // per cell × channel × training week, at mediaStart, what the media gradient reads (density-kernels):
  // exponential e = exp(−a/θ) and the unnormalised adstock S with D = dS/dα; Hill p, q, q·(D/S − W′/W), q·log(a/θ)
  private readonly expSlope: Float64Array;
  private readonly adstockSum: Float64Array;
  private readonly adstockSumDerivative: Float64Array;
  private readonly hillP: Float64Array;
  private readonly hillQ: Float64Array;
  private readonly hillQAlpha: Float64Array;
  private readonly hillQShape: Float64Array;
  /** Per channel of the current cell: the weight of its media column (see logDensityGradient). */
  private readonly mediaWeight: Float64Array;
  // per week buffers
  private readonly mean: Float64Array;
  private readonly rho: Float64Array;
  private readonly hillScratch = new Float64Array(4);
  /** Receives prior derivatives when only values are wanted. */
  private readonly priorScratch = new Float64Array(1);

  constructor(
    constants: PortfolioConstants,
    options: ResolvedPortfolioOptions,
    layout: ParameterLayout,
    cellIndexOffset = 0,
  ) {
    this.constants = constants;
    this.options = options;
    this.layout = layout;
    this.cellIndexOffset = cellIndexOffset;
    this.dimension = layout.dimension;
    this.constrainedNames = portfolioParameterNames(constants, options, layout, cellIndexOffset);
    const C = constants.channelCount;
    const G = constants.cellCount;
    const N = constants.totalWeeks;
    this.mu = new Float64Array(C);
    this.tauBrand = new Float64Array(C);
    this.tauMarket = new Float64Array(C);
    this.tauCell = new Float64Array(C);
    this.alpha = new Float64Array(C);
    this.lambda = new Float64Array(C);
    this.hillShape = new Float64Array(C).fill(1);
    this.beta = new Float64Array(G * C);
    this.theta = new Float64Array(G * C);
    this.gradLogBeta = new Float64Array(G * C);
    this.gradAlpha = new Float64Array(C);
    this.gradLogTheta = new Float64Array(G * C);
    this.gradLogShape = new Float64Array(C);
    this.mediaMean = new Float64Array(G * C);
    this.logBetaGroup = new Float64Array(G * C);
    this.cellV = new Float64Array(G * C);
    const B = constants.brands.length;
    const M = constants.markets.length;
    this.deltaBrand = new Float64Array(B * C);
    this.channelLevel = new GuidedChannelLevel(B, M, C, constants.cellBrand, constants.cellMarket, layout.zBrand >= 0, layout.zMarket >= 0);
    this.gradDeltaBrand = new Float64Array(B * C);
    this.deltaMarket = new Float64Array(M * C);
    this.marketV = new Float64Array(M * C);
    this.marketS = new Float64Array(M * C);
    this.marketP = new Float64Array(M * C);
    this.gradDeltaMarket = new Float64Array(M * C);
    this.cellM = new Float64Array(G * C);
    this.guideTracks = layout.guideSlopeAlpha.some((v) => v !== 0) || layout.guideSlopeLogLambda.some((v) => v !== 0);
    this.guideMeanNow = Float64Array.from(layout.guideMean);
    this.guideMeanGrad = new Float64Array(G * C);
    this.guideShiftAlpha = new Float64Array(C);
    this.guideShiftLambda = new Float64Array(C);
    for (let g = 0; g < G; g++) {
      for (let c = 0; c < C; c++) {
        // the media columns of a cell are read as one block of C columns of its weeks
        const at = constants.mediaStart[g * C]! + c * constants.weeks[g]!;
        if (constants.mediaStart[g * C + c] !== at) throw new Error("media series must be stored channel after channel within a cell");
      }
    }
    const emptied: number[] = [];
    this.emptiedStart = new Int32Array(G * C);
    for (let gc = 0; gc < G * C; gc++) {
      this.emptiedStart[gc] = emptied.length;
      adstockEmptiedWeeks(constants.spend, constants.mediaStart[gc]!, constants.trainWeeks[Math.floor(gc / C)]!, constants.maxLag, emptied);
      emptied.push(-1);
    }
    this.emptiedWeeks = Int32Array.from(emptied);
    this.adstockInvWeight = new Float64Array(C);
    this.adstockDScale = new Float64Array(C);
    this.adstockWeightRatio = new Float64Array(C);
    const hill = options.saturation === "hill";
    this.expSlope = new Float64Array(hill ? 0 : C * N);
    this.adstockSum = new Float64Array(C * N);
    this.adstockSumDerivative = new Float64Array(C * N);
    this.mediaWeight = new Float64Array(C);
    this.hillP = new Float64Array(hill ? C * N : 0);
    this.hillQ = new Float64Array(hill ? C * N : 0);
    this.hillQAlpha = new Float64Array(hill ? C * N : 0);
    this.hillQShape = new Float64Array(hill ? C * N : 0);
    this.mean = new Float64Array(N);
    this.rho = new Float64Array(N);
  }

  /** Reads q into the channel-level values and the cell effects β, θ; returns the log prior of those blocks. */
  private readChannelBlocks(q: Float64Array, grad: Float64Array | undefined): number {
    const k = this.constants;
    const lay = this.layout;
    const C = k.channelCount;
    const G = k.cellCount;
    const scratch = grad ?? this.priorScratch;
    let lp = 0;
    const pooled = lay.structure === "pooled";
    for (let c = 0; c < C; c++) {
      if (!pooled) {
        // η = μ block of the single cell, non-centred on its prior; pooled: built with the brands below
        const uMu = q[lay.mu + c]!;
        this.mu[c] = k.muPriorMean[c]! + k.muPriorSd[c]! * uMu;
        lp -= 0.5 * uMu * uMu;
        if (grad) grad[lay.mu + c] = -uMu;
      }
      if (lay.tauBrand >= 0) {
        this.tauBrand[c] = Math.exp(q[lay.tauBrand + c]!);
        lp += halfNormalPriorOnLog(q[lay.tauBrand + c]!, TAU_PRIOR_SCALE, scratch, grad ? lay.tauBrand + c : 0);
      } else this.tauBrand[c] = 0;
      if (lay.tauMarket >= 0) {
        this.tauMarket[c] = Math.exp(q[lay.tauMarket + c]!);
        lp += halfNormalPriorOnLog(q[lay.tauMarket + c]!, TAU_PRIOR_SCALE, scratch, grad ? lay.tauMarket + c : 0);
      } else this.tauMarket[c] = 0;
      if (lay.tauCell >= 0) {
        this.tauCell[c] = Math.exp(q[lay.tauCell + c]!);
        lp += halfNormalPriorOnLog(q[lay.tauCell + c]!, TAU_PRIOR_SCALE, scratch, grad ? lay.tauCell + c : 0);
      } else this.tauCell[c] = 0;
      const uAlpha = q[lay.alpha + c]!;
      this.alpha[c] = logistic(uAlpha);
      lp += betaPriorOnLogit(uAlpha, 2, 2, scratch, grad ? lay.alpha + c : 0);
      const uLambda = q[lay.lambda + c]!;
      this.lambda[c] = Math.exp(LOG_TWO + LAMBDA_PRIOR_SD * uLambda);
      lp -= 0.5 * uLambda * uLambda;
      if (grad) grad[lay.lambda + c] = -uLambda;
      if (lay.hillShape >= 0) {
        const uShape = q[lay.hillShape + c]!;
        this.hillShape[c] = Math.exp(HILL_SHAPE_PRIOR_SD * uShape);
        lp -= 0.5 * uShape * uShape;
        if (grad) grad[lay.hillShape + c] = -uShape;
      }
    }
    const M = k.markets.length;
    const guideMean = this.trackGuide(q);
    const guidePrecision = lay.guidePrecision;
    // Levels are built in order (μ with the brands) → market → cell; each is guided by the
    // cells' data estimates given the levels before it (see ParameterLayout), so the map
    // is triangular: its log-Jacobian is −log det chol(Λ) for μ and the brands and Σ log √v below.
    for (let c = 0; c < C; c++) {
      if (pooled) {
        lp += this.channelLevel.build(
          c, k.muPriorMean[c]!, k.muPriorSd[c]!, this.tauBrand[c]!, this.tauMarket[c]!, this.tauCell[c]!,
          guideMean, guidePrecision, q, lay.mu, lay.zBrand, this.mu, this.deltaBrand,
        );
      }
      const mu = this.mu[c]!;
      const tauG2 = this.tauCell[c]! * this.tauCell[c]!;
      const tauM2 = lay.zMarket >= 0 ? this.tauMarket[c]! * this.tauMarket[c]! : 0;
      if (lay.zMarket >= 0) {
        const aM = 1 / tauM2;
        for (let m = 0; m < M; m++) {
          let P = 0;
          let S = 0;
          for (let g = 0; g < G; g++) {
            const gc = g * C + c;
            const prec = guidePrecision[gc]!;
            if (k.cellMarket[g] !== m || prec === 0) continue;
            const w = 1 / (tauG2 + 1 / prec);
            const brandPart = lay.zBrand >= 0 ? this.deltaBrand[k.cellBrand[g]! * C + c]! : 0;
            P += w;
            S += w * (guideMean[gc]! - mu - brandPart);
          }
          const i = m * C + c;
          const v = 1 / (aM + P);
          const delta = v * S + Math.sqrt(v) * q[lay.zMarket + i]!;
          this.deltaMarket[i] = delta;
          this.marketV[i] = v;
          this.marketS[i] = S;
          this.marketP[i] = P;
          lp += -0.5 * aM * delta * delta + 0.5 * Math.log(aM * v);
        }
      }
      for (let g = 0; g < G; g++) {
        const gc = g * C + c;
        let group = mu;
        if (lay.zBrand >= 0) group += this.deltaBrand[k.cellBrand[g]! * C + c]!;
        if (lay.zMarket >= 0) group += this.deltaMarket[k.cellMarket[g]! * C + c]!;
        let logBeta = group;
        if (lay.zCell >= 0) {
          // log β = m + √v·u, v = 1/(a + b), m = v·(a·group + b·m̂), a = 1/τG², b = guide precision;
          // log p += log Normal(log β | group, τG) + log √v
          const u = q[lay.zCell + gc]!;
          const a = 1 / tauG2;
          const b = guidePrecision[gc]!;
          const v = 1 / (a + b);
          const m = v * (a * group + b * guideMean[gc]!);
          logBeta = m + Math.sqrt(v) * u;
          const d = logBeta - group;
          lp += -0.5 * a * d * d + 0.5 * Math.log(a * v);
          this.cellV[gc] = v;
          this.cellM[gc] = m;
        }
        this.logBetaGroup[gc] = group;
        this.beta[gc] = Math.exp(logBeta);
        this.theta[gc] = this.lambda[c]! * k.spendMean[gc]!;
      }
    }
    return lp;
  }

  /** Per channel constants of the adstock at the current α (see adstockGeometricUnchecked). */
  private prepareAdstock(): void {
    const C = this.constants.channelCount;
    const L = this.constants.maxLag;
    for (let c = 0; c < C; c++) {
      const alpha = this.alpha[c]!;
      const invWeightSum = 1 / adstockWeightSum(alpha, L);
      const weightSumDerivative = adstockWeightSumDerivative(alpha, L);
      this.adstockInvWeight[c] = invWeightSum;
      this.adstockDScale[c] = weightSumDerivative * invWeightSum * invWeightSum;
      this.adstockWeightRatio[c] = weightSumDerivative * invWeightSum;
    }
  }

  /**
   * The adstock and saturation of an active cell × channel over its training weeks (after
   * prepareAdstock): writes the media gradient buffers and mediaMean, mean_t r(a[t]). Then
   * `expSlope` (exponential, r = θ(1 − e)) or `hillP` (Hill, r = θp) holds the regressor in
   * the cell's block of C columns from mediaStart[g·C], read as columns by logDensityGradient.
   */
  private mediaPass(g: number, c: number): void {
    const k = this.constants;
    const gc = g * k.channelCount + c;
    const theta = this.theta[gc]!;
    const kappa = this.adstockInvWeight[c]! / theta;
    const train = k.trainWeeks[g]!;
    const ms = k.mediaStart[gc]!;
    adstockSumsUnchecked(k.spend, ms, train, this.alpha[c]!, k.maxLag, this.adstockSum, this.adstockSumDerivative, ms, this.emptiedWeeks, this.emptiedStart[gc]!);
    if (this.options.saturation === "hill") {
      const sumP = hillSaturation(
        this.adstockSum, this.adstockSumDerivative, ms, train, kappa, this.adstockInvWeight[c]!, this.adstockDScale[c]!,
        this.adstockWeightRatio[c]!, theta, this.hillShape[c]!, this.hillP, this.hillQ, this.hillQAlpha, this.hillQShape,
      );
      this.mediaMean[gc] = (theta * sumP) / train;
    } else {
      this.mediaMean[gc] = (theta * exponentialSaturation(this.adstockSum, ms, train, kappa, this.expSlope)) / train;
    }
  }

  /** The media means mean_t r(a[t]) of every cell × channel at the current α, θ and Hill shape. */
  private computeMedia(): void {
    const k = this.constants;
    const C = k.channelCount;
    this.prepareAdstock();
    for (let g = 0; g < k.cellCount; g++) {
      for (let c = 0; c < C; c++) {
        const gc = g * C + c;
        if (k.channelActive[gc] === 0) this.mediaMean[gc] = 0;
        else this.mediaPass(g, c);
      }
    }
  }

  logDensityGradient(q: Float64Array, grad: Float64Array): number {
    grad.fill(0);
    const k = this.constants;
    const lay = this.layout;
    const C = k.channelCount;
    const G = k.cellCount;
    const J = k.seasonalityOrder;
    const K = k.controlCount;
    let lp = this.readChannelBlocks(q, grad);
    const hill = lay.hillShape >= 0;
    this.prepareAdstock();
    this.gradLogBeta.fill(0);
    this.gradLogTheta.fill(0);
    this.gradAlpha.fill(0);
    this.gradLogShape.fill(0);

    const studentT = lay.nu >= 0;
    let nu = 0;
    let nuConstant = 0;
    let gradNuPerWeek = 0;
    let gradNu = 0;
    let weeksInLikelihood = 0;
    if (studentT) {
      const uNu = q[lay.nu]!;
      nu = Math.exp(uNu);
      lp += gammaPriorOnLog(uNu, 2, 0.1, grad, lay.nu);
      nuConstant = logGamma((nu + 1) / 2) - logGamma(nu / 2) - 0.5 * Math.log(nu);
      gradNuPerWeek = 0.5 * digamma((nu + 1) / 2) - 0.5 * digamma(nu / 2) - 0.5 / nu;
    }

    const mean = this.mean;
    const rho = this.rho;
    const seasonal = k.seasonal;
    const trend = k.trend;
    const controlDesign = k.controlDesign;
    const outcome = k.outcome;
    const mediaColumns = hill ? this.hillP : this.expSlope;
    const mediaWeight = this.mediaWeight;
    for (let g = 0; g < G; g++) {
      const T = k.weeks[g]!;
      const train = k.trainWeeks[g]!;
      const start = k.weekStart[g]!;
      const scale = k.outcomeScale[g]!;
      const block = lay.cells + g * lay.cellStride;
      const u0 = q[block]!;
      const u1 = q[block + 1]!;
      const beta0 = k.outcomeMean[g]! + scale * u0;
      const beta1 = scale * u1;
      lp -= 0.5 * (u0 * u0 + u1 * u1);
      grad[block] = -u0;
      grad[block + 1] = -u1;
      // mean[t] = β0 + β1·ť + seasonality + controls + Σ_c β·(r(a[t]) − mean(r)), with the media
      // as columns of e (β·r = βθ − βθ·e) or p (β·r = βθ·p) and their constant parts in the intercept
      const sBase = k.seasonalStart[g]!;
      let intercept = beta0;
      for (let c = 0; c < C; c++) {
        const gc = g * C + c;
        mediaWeight[c] = 0;
        if (k.channelActive[gc] === 0) continue;
        this.mediaPass(g, c);
        const b = this.beta[gc]!;
        const bTheta = b * this.theta[gc]!;
        if (hill) {
          intercept -= b * this.mediaMean[gc]!;
          mediaWeight[c] = bTheta;
        } else {
          intercept += bTheta - b * this.mediaMean[gc]!;
          mediaWeight[c] = -bTheta;
        }
      }
      const mediaBase = k.mediaStart[g * C]!;
      setLineAndColumns(mean, start, intercept, beta1, trend, start, seasonal, sBase, T, q, block + 2, 0.5 * scale, 2 * J, train);
      for (let j = 0; j < 2 * J; j++) {
        const u = q[block + 2 + j]!;
        lp -= 0.5 * u * u;
        grad[block + 2 + j] = -u;
      }
      const logSigmaIndex = block + 2 + 2 * J;
      const vSigma = q[logSigmaIndex]!;
      const sigma = scale * Math.exp(vSigma);
      // σ ~ HalfNormal(s): on v = log(σ/s), log p = −e^{2v}/2 + v
      const sigmaOverScale = Math.exp(vSigma);
      lp += -0.5 * sigmaOverScale * sigmaOverScale + vSigma;
      grad[logSigmaIndex] = -sigmaOverScale * sigmaOverScale + 1;
      const cBase = k.controlStart[g]!;
      for (let j = 0; j < K; j++) {
        const u = q[logSigmaIndex + 1 + j]!;
        lp -= 0.5 * u * u;
        grad[logSigmaIndex + 1 + j] = -u;
      }
      addColumns(mean, start, controlDesign, cBase, T, q, logSigmaIndex + 1, scale, K, train);
      addColumns(mean, start, mediaColumns, mediaBase, T, mediaWeight, 0, 1, C, train);

      // likelihood over the training weeks
      let sumRho = 0;
      let gradV = 0;
      const invSigma = 1 / sigma;
      if (!studentT) {
        let sumSq = 0;
        const invVar = invSigma * invSigma;
        for (let t = 0; t < train; t++) {
          const e = outcome[start + t]! - mean[start + t]!;
          sumSq += e * e;
          const r = e * invVar;
          rho[start + t] = r;
          sumRho += r;
        }
        lp += -train * Math.log(sigma) - 0.5 * sumSq * invVar;
        gradV = -train + sumSq * invVar;
      } else {
        // ρ = (ν+1)·z/(σ·(ν + z²)); d/dv and d/dν of the week's term use w = z²/(ν + z²)
        const nuPlusOne = nu + 1;
        const invNu = 1 / nu;
        let sumLog = 0;
        let sumW = 0;
        for (let t = 0; t < train; t++) {
          const e = outcome[start + t]! - mean[start + t]!;
          const z = e * invSigma;
          const z2 = z * z;
          const invDenom = 1 / (nu + z2);
          sumLog += Math.log1p(z2 * invNu);
          const r = nuPlusOne * z * invSigma * invDenom;
          rho[start + t] = r;
          sumRho += r;
          sumW += z2 * invDenom;
        }
        lp += train * (nuConstant - Math.log(sigma)) - 0.5 * nuPlusOne * sumLog;
        gradV = nuPlusOne * sumW - train;
        gradNu += 0.5 * nuPlusOne * invNu * sumW - 0.5 * sumLog;
        weeksInLikelihood += train;
      }
      grad[logSigmaIndex] = grad[logSigmaIndex]! + gradV;
      const rhoMean = sumRho / train;

      // baseline coefficients; then ρ is replaced by φ = ρ − ρ̄ for the media
      grad[block] = grad[block]! + scale * sumRho;
      addColumnDots(rho, start, controlDesign, cBase, T, K, train, scale, grad, logSigmaIndex + 1);
      const sPhi = lineAndColumnDotsThenCentre(rho, start, rhoMean, trend, start, scale, seasonal, sBase, T, 0.5 * scale, 2 * J, train, grad, block + 1, block + 2);

      // media: d/dr[t] = β·φ[t] because r̃ = r − mean(r)
      for (let c = 0; c < C; c++) {
        const gc = g * C + c;
        if (k.channelActive[gc] === 0) continue;
        const ms = k.mediaStart[gc]!;
        const theta = this.theta[gc]!;
        let sR: number;
        let sTheta: number;
        let sAlpha: number;
        let sShape = 0;
        if (!hill) {
          // r = θ(1 − e), dr/dθ = 1 − e − (a/θ)e, dr/da = e, with e = exp(−a/θ), a = S/W, da/dα = D/W − S·W′/W²
          const e = this.expSlope;
          const S = this.adstockSum;
          const D = this.adstockSumDerivative;
          let sE = 0;
          let sES = 0;
          let sED = 0;
          for (let t = 0; t < train; t++) {
            const i = ms + t;
            const pe = rho[start + t]! * e[i]!;
            sE += pe;
            sES += pe * S[i]!;
            sED += pe * D[i]!;
          }
          const invW = this.adstockInvWeight[c]!;
          sR = theta * (sPhi - sE);
          sTheta = sPhi - sE - (sES * invW) / theta;
          sAlpha = sED * invW - sES * this.adstockDScale[c]!;
        } else {
          // r = θp, dr/dθ = p − kq, dr/dk = θ·q·log(a/θ), (dr/da)·(da/dα) = kθ·q·(D/S − W′/W)
          const P = this.hillP;
          const Q = this.hillQ;
          const QA = this.hillQAlpha;
          const QK = this.hillQShape;
          const shape = this.hillShape[c]!;
          let sP = 0;
          let sQ = 0;
          let sQA = 0;
          let sQK = 0;
          for (let t = 0; t < train; t++) {
            const i = ms + t;
            const phi = rho[start + t]!;
            sP += phi * P[i]!;
            sQ += phi * Q[i]!;
            sQA += phi * QA[i]!;
            sQK += phi * QK[i]!;
          }
          sR = theta * sP;
          sTheta = sP - shape * sQ;
          sAlpha = shape * theta * sQA;
          sShape = theta * sQK;
        }
        const b = this.beta[gc]!;
        this.gradLogBeta[gc] = this.gradLogBeta[gc]! + b * sR;
        this.gradLogTheta[gc] = this.gradLogTheta[gc]! + b * sTheta * theta;
        this.gradAlpha[c] = this.gradAlpha[c]! + b * sAlpha;
        if (hill) this.gradLogShape[c] = this.gradLogShape[c]! + b * sShape * this.hillShape[c]!;
      }
    }
    if (studentT) {
      gradNu += weeksInLikelihood * gradNuPerWeek;
      grad[lay.nu] = grad[lay.nu]! + gradNu * nu;
    }

    if (k.liftTests.length > 0) lp += this.liftTestTerm(true);

    // chain rule back to the unconstrained coordinates: cells, then markets, then brands
    const M = k.markets.length;
    const guideMean = this.guideMeanNow;
    const guidePrecision = lay.guidePrecision;
    const guideMeanGrad = this.guideMeanGrad;
    guideMeanGrad.fill(0);
    this.gradDeltaBrand.fill(0);
    this.gradDeltaMarket.fill(0);
    for (let c = 0; c < C; c++) {
      let gMu = 0;
      let gTauB = 0;
      let gTauM = 0;
      let gTauG = 0;
      let gLogLambda = 0;
      const tauG2 = this.tauCell[c]! * this.tauCell[c]!;
      const tauM2 = lay.zMarket >= 0 ? this.tauMarket[c]! * this.tauMarket[c]! : 0;
      for (let g = 0; g < G; g++) {
        const gc = g * C + c;
        // gb: derivative with respect to the group mean μ + δB + δM of this cell
        let gb = this.gradLogBeta[gc]!;
        if (lay.zCell >= 0) {
          const zi = lay.zCell + gc;
          const a = 1 / tauG2;
          const v = this.cellV[gc]!;
          const sdv = Math.sqrt(v);
          const u = q[zi]!;
          const group = this.logBetaGroup[gc]!;
          const d = Math.log(this.beta[gc]!) - group;
          const total = gb - a * d; // d/d log β with the group and τG held
          grad[zi] = grad[zi]! + total * sdv;
          guideMeanGrad[gc] = guideMeanGrad[gc]! + total * v * guidePrecision[gc]!;
          const dLogBetaDa = v * (group - this.cellM[gc]!) - 0.5 * v * sdv * u;
          const dA = total * dLogBetaDa - 0.5 * d * d + 0.5 / a - 0.5 * v;
          gTauG += -2 * a * dA;
          gb = total * v * a + a * d;
        }
        gMu += gb;
        if (lay.zBrand >= 0) this.gradDeltaBrand[k.cellBrand[g]! * C + c] = this.gradDeltaBrand[k.cellBrand[g]! * C + c]! + gb;
        if (lay.zMarket >= 0) this.gradDeltaMarket[k.cellMarket[g]! * C + c] = this.gradDeltaMarket[k.cellMarket[g]! * C + c]! + gb;
        gLogLambda += this.gradLogTheta[gc]!;
      }
      if (lay.zMarket >= 0) {
        const aM = 1 / tauM2;
        for (let m = 0; m < M; m++) {
          const i = m * C + c;
          const v = this.marketV[i]!;
          const sdv = Math.sqrt(v);
          const delta = this.deltaMarket[i]!;
          const u = q[lay.zMarket + i]!;
          const total = this.gradDeltaMarket[i]! - aM * delta;
          grad[lay.zMarket + i] = grad[lay.zMarket + i]! + total * sdv;
          const dS = total * v;
          const dV = total * (this.marketS[i]! + u / (2 * sdv)) + 0.5 / v;
          gTauM += -2 * aM * (-v * v * dV - 0.5 * delta * delta + 0.5 / aM);
          const dP = -v * v * dV;
          gMu -= dS * this.marketP[i]!;
          for (let g = 0; g < G; g++) {
            const gc = g * C + c;
            const prec = guidePrecision[gc]!;
            if (k.cellMarket[g] !== m || prec === 0) continue;
            const w = 1 / (tauG2 + 1 / prec);
            guideMeanGrad[gc] = guideMeanGrad[gc]! + dS * w;
            let r = guideMean[gc]! - this.mu[c]!;
            if (lay.zBrand >= 0) {
              const bi = k.cellBrand[g]! * C + c;
              r -= this.deltaBrand[bi]!;
              this.gradDeltaBrand[bi] = this.gradDeltaBrand[bi]! - dS * w;
            }
            gTauG += (dP + dS * r) * (-2 * tauG2 * w * w);
          }
        }
      }
      if (lay.structure === "pooled") {
        const out = this.channelLevelGradient;
        this.channelLevel.backprop(
          c, k.muPriorMean[c]!, k.muPriorSd[c]!, this.tauBrand[c]!, this.tauMarket[c]!, this.tauCell[c]!,
          guideMean, guidePrecision, gMu, this.gradDeltaBrand, lay.mu, lay.zBrand, grad, out, guideMeanGrad,
        );
        gTauB += out[0]!;
        gTauM += out[1]!;
        gTauG += out[2]!;
      } else grad[lay.mu + c] = grad[lay.mu + c]! + gMu * k.muPriorSd[c]!;
      if (lay.tauBrand >= 0) grad[lay.tauBrand + c] = grad[lay.tauBrand + c]! + gTauB;
      if (lay.tauMarket >= 0) grad[lay.tauMarket + c] = grad[lay.tauMarket + c]! + gTauM;
      if (lay.tauCell >= 0) grad[lay.tauCell + c] = grad[lay.tauCell + c]! + gTauG;
      const a = this.alpha[c]!;
      grad[lay.alpha + c] = grad[lay.alpha + c]! + this.gradAlpha[c]! * a * (1 - a);
      grad[lay.lambda + c] = grad[lay.lambda + c]! + gLogLambda * LAMBDA_PRIOR_SD;
      if (lay.hillShape >= 0) grad[lay.hillShape + c] = grad[lay.hillShape + c]! + this.gradLogShape[c]! * HILL_SHAPE_PRIOR_SD;
    }
    if (this.guideTracks) {
      // the guide's means follow logit α and log λ = log 2 + 0.75·u (see ParameterLayout)
      const sA = lay.guideSlopeAlpha;
      const sL = lay.guideSlopeLogLambda;
      for (let gc = 0; gc < G * C; gc++) {
        const gm = guideMeanGrad[gc]!;
        if (gm === 0) continue;
        for (let c = 0; c < C; c++) {
          grad[lay.alpha + c] = grad[lay.alpha + c]! + gm * sA[gc * C + c]!;
          grad[lay.lambda + c] = grad[lay.lambda + c]! + gm * sL[gc * C + c]! * LAMBDA_PRIOR_SD;
        }
      }
    }
    return lp;
  }

  /** The guide's means at q: fixed, or moved with the sampler's α and λ (see ParameterLayout). */
  private trackGuide(q: Float64Array): Float64Array {
    const lay = this.layout;
    if (!this.guideTracks) return lay.guideMean;
    const C = this.constants.channelCount;
    const G = this.constants.cellCount;
    const dAlpha = this.guideShiftAlpha;
    const dLambda = this.guideShiftLambda;
    for (let c = 0; c < C; c++) {
      dAlpha[c] = q[lay.alpha + c]! - lay.guideLogitAlpha[c]!;
      dLambda[c] = LOG_TWO + LAMBDA_PRIOR_SD * q[lay.lambda + c]! - lay.guideLogLambda[c]!;
    }
    const out = this.guideMeanNow;
    for (let gc = 0; gc < G * C; gc++) {
      let m = lay.guideMean[gc]!;
      if (lay.guidePrecision[gc]! > 0) for (let c = 0; c < C; c++) m += lay.guideSlopeAlpha[gc * C + c]! * dAlpha[c]! + lay.guideSlopeLogLambda[gc * C + c]! * dLambda[c]!;
      out[gc] = m;
    }
    return out;
  }

  /**
   * Lift tests: measured ~ Normal(β·Σ_window [r(a) − r(a − b)], se), where b is the adstock
   * of the channel's spend inside the window only (so a − b is the adstock with that spend
   * set to zero). Adds to the gradient buffers when `withGradient`.
   */
  private liftTestTerm(withGradient: boolean): number {
    const k = this.constants;
    const C = k.channelCount;
    const L = k.maxLag;
    const hill = this.options.saturation === "hill";
    const hs = this.hillScratch;
    let lp = 0;
    for (const test of k.liftTests) {
      const c = test.channel;
      const gc = test.cell * C + c;
      const alpha = this.alpha[c]!;
      const theta = this.theta[gc]!;
      const shape = this.hillShape[c]!;
      const b = this.beta[gc]!;
      const W = adstockWeightSum(alpha, L);
      const dW = adstockWeightSumDerivative(alpha, L);
      const ms = k.mediaStart[gc]!;
      let sumR = 0;
      let sumTheta = 0;
      let sumAlpha = 0;
      let sumShape = 0;
      for (let t = test.firstWeek; t <= test.lastWeek; t++) {
        // the adstock a[t] as direct sums over the spend inside the window and before it
        // (a0 = a − b, the adstock without the window's spend), with their α-derivatives
        let inside = 0;
        let dInside = 0;
        let before = 0;
        let dBefore = 0;
        let power = 1;
        let powerBelow = 0; // α^{l−1}
        for (let l = 0; l < L && t - l >= 0; l++) {
          const x = k.spend[ms + t - l]!;
          const v = power * x;
          const dv = (l * powerBelow * W - power * dW) * x;
          if (t - l >= test.firstWeek) {
            inside += v;
            dInside += dv;
          } else {
            before += v;
            dBefore += dv;
          }
          powerBelow = power;
          power *= alpha;
        }
        const a = (inside + before) / W;
        const da = (dInside + dBefore) / (W * W);
        const a0 = before / W;
        const da0 = dBefore / (W * W);
        if (!hill) {
          const e = Math.exp(-a / theta);
          const e0 = Math.exp(-a0 / theta);
          sumR += theta * (e0 - e);
          sumTheta += 1 - e - (a / theta) * e - (1 - e0 - (a0 / theta) * e0);
          sumAlpha += e * da - e0 * da0;
        } else {
          saturationHillWithDerivatives(a, theta, shape, hs);
          const r = hs[0]!;
          const ra = hs[1]!;
          const rt = hs[2]!;
          const rk = hs[3]!;
          saturationHillWithDerivatives(a0, theta, shape, hs);
          sumR += r - hs[0]!;
          sumTheta += rt - hs[2]!;
          sumAlpha += ra * da - hs[1]! * da0;
          sumShape += rk - hs[3]!;
        }
      }
      const implied = b * sumR;
      const z = (test.incrementalOutcome - implied) / test.standardError;
      lp -= 0.5 * z * z;
      if (withGradient) {
        const psi = z / test.standardError;
        this.gradLogBeta[gc] = this.gradLogBeta[gc]! + psi * implied;
        this.gradLogTheta[gc] = this.gradLogTheta[gc]! + psi * b * sumTheta * theta;
        this.gradAlpha[c] = this.gradAlpha[c]! + psi * b * sumAlpha;
        if (hill) this.gradLogShape[c] = this.gradLogShape[c]! + psi * b * sumShape * shape;
      }
    }
    return lp;
  }

  constrain(q: Float64Array, out: Float64Array): void {
    writeConstrained(this, q, out);
  }

  /** Per-cell media means mean_t r(a[t]) at q (the centring of the media regressors). */
  mediaMeansAt(q: Float64Array, out: Float64Array): void {
    this.readChannelBlocks(q, undefined);
    this.computeMedia();
    out.set(this.mediaMean);
  }

  initialPoint(rng: RandomSource, out: Float64Array): void {
    const lay = this.layout;
    for (let i = 0; i < out.length; i++) out[i] = 0.5 * (2 * rng.uniform() - 1);
    const C = this.constants.channelCount;
    const setAround = (at: number, count: number, centre: number): void => {
      if (at < 0) return;
      for (let i = 0; i < count; i++) out[at + i] = centre + 0.5 * (2 * rng.uniform() - 1);
    };
    setAround(lay.tauBrand, C, Math.log(0.3));
    setAround(lay.tauMarket, C, Math.log(0.3));
    setAround(lay.tauCell, C, Math.log(0.3));
    for (let g = 0; g < this.constants.cellCount; g++) {
      const at = lay.cells + g * lay.cellStride + 2 + 2 * this.constants.seasonalityOrder;
      out[at] = Math.log(0.5) + 0.5 * (2 * rng.uniform() - 1);
    }
    if (lay.nu >= 0) out[lay.nu] = Math.log(10) + 0.5 * (2 * rng.uniform() - 1);
  }

  /** Values needed by `constrain`: read-only views of the current channel and cell effects. */
  evaluateEffects(q: Float64Array): {
    readonly mu: Float64Array;
    readonly tauBrand: Float64Array;
    readonly tauMarket: Float64Array;
    readonly tauCell: Float64Array;
    readonly alpha: Float64Array;
    readonly lambda: Float64Array;
    readonly hillShape: Float64Array;
    readonly beta: Float64Array;
    readonly theta: Float64Array;
    readonly mediaMean: Float64Array;
    readonly logBetaGroup: Float64Array;
    readonly deltaBrand: Float64Array;
    readonly deltaMarket: Float64Array;
  } {
    this.readChannelBlocks(q, undefined);
    this.computeMedia();
    return {
      mu: this.mu,
      tauBrand: this.tauBrand,
      tauMarket: this.tauMarket,
      tauCell: this.tauCell,
      alpha: this.alpha,
      lambda: this.lambda,
      hillShape: this.hillShape,
      beta: this.beta,
      theta: this.theta,
      mediaMean: this.mediaMean,
      logBetaGroup: this.logBetaGroup,
      deltaBrand: this.deltaBrand,
      deltaMarket: this.deltaMarket,
    };
  }

  /** Log density only (no gradient), for tests and checks. */
  logDensity(q: Float64Array): number {
    const scratch = new Float64Array(this.dimension);
    return this.logDensityGradient(q, scratch);
  }
}

/** Writes the constrained quantities in the order of `portfolioParameterNames`. */
function writeConstrained(model: PortfolioDensity, q: Float64Array, out: Float64Array): void {
  const k = model.constants;
  const lay = model.layout;
  const C = k.channelCount;
  const G = k.cellCount;
  const J = k.seasonalityOrder;
  const K = k.controlCount;
  const B = k.brands.length;
  const M = k.markets.length;
  const fx = model.evaluateEffects(q);
  let o = 0;
  const pooled = lay.structure === "pooled";
  if (pooled) {
    for (let c = 0; c < C; c++) out[o++] = fx.mu[c]!;
    if (lay.tauBrand >= 0) for (let c = 0; c < C; c++) out[o++] = fx.tauBrand[c]!;
    if (lay.tauMarket >= 0) for (let c = 0; c < C; c++) out[o++] = fx.tauMarket[c]!;
    for (let c = 0; c < C; c++) out[o++] = fx.tauCell[c]!;
  }
  for (let c = 0; c < C; c++) out[o++] = fx.alpha[c]!;
  for (let c = 0; c < C; c++) out[o++] = fx.lambda[c]!;
  if (lay.hillShape >= 0) for (let c = 0; c < C; c++) out[o++] = fx.hillShape[c]!;
  if (!pooled) for (let c = 0; c < C; c++) out[o++] = fx.mu[c]!; // η = log β
  for (let g = 0; g < G; g++) for (let c = 0; c < C; c++) out[o++] = fx.beta[g * C + c]!;
  for (let g = 0; g < G; g++) for (let c = 0; c < C; c++) out[o++] = 1 / fx.beta[g * C + c]!;
  for (let g = 0; g < G; g++) for (let c = 0; c < C; c++) out[o++] = fx.theta[g * C + c]!;
  if (pooled) {
    for (let g = 0; g < G; g++) for (let c = 0; c < C; c++) out[o++] = fx.logBetaGroup[g * C + c]!;
    if (lay.zBrand >= 0) for (let i = 0; i < B * C; i++) out[o++] = fx.deltaBrand[i]!;
    if (lay.zMarket >= 0) for (let i = 0; i < M * C; i++) out[o++] = fx.deltaMarket[i]!;
    for (let g = 0; g < G; g++) for (let c = 0; c < C; c++) out[o++] = Math.log(fx.beta[g * C + c]!) - fx.logBetaGroup[g * C + c]!;
  }
  for (let g = 0; g < G; g++) {
    const block = lay.cells + g * lay.cellStride;
    out[o++] = k.outcomeMean[g]! + k.outcomeScale[g]! * q[block]!;
  }
  for (let g = 0; g < G; g++) out[o++] = k.outcomeScale[g]! * q[lay.cells + g * lay.cellStride + 1]!;
  for (let g = 0; g < G; g++) out[o++] = k.outcomeScale[g]! * Math.exp(q[lay.cells + g * lay.cellStride + 2 + 2 * J]!);
  for (let g = 0; g < G; g++) {
    let level = k.outcomeMean[g]! + k.outcomeScale[g]! * q[lay.cells + g * lay.cellStride]!;
    for (let c = 0; c < C; c++) level -= fx.beta[g * C + c]! * fx.mediaMean[g * C + c]!;
    out[o++] = level;
  }
  for (let g = 0; g < G; g++) for (let j = 0; j < J; j++) out[o++] = 0.5 * k.outcomeScale[g]! * q[lay.cells + g * lay.cellStride + 2 + 2 * j]!;
  for (let g = 0; g < G; g++) for (let j = 0; j < J; j++) out[o++] = 0.5 * k.outcomeScale[g]! * q[lay.cells + g * lay.cellStride + 3 + 2 * j]!;
  for (let g = 0; g < G; g++) for (let j = 0; j < K; j++) out[o++] = k.outcomeScale[g]! * q[lay.cells + g * lay.cellStride + 3 + 2 * J + j]!;
  if (lay.nu >= 0) out[o++] = Math.exp(q[lay.nu]!);
}
