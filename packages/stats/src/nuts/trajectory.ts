import type { DensityModel } from "../model/density-model";
import type { RandomSource } from "../rng/random-source";
import { leapfrog } from "./integrator";
import type { PhasePoint } from "./phase-point";
import { createProposal, logSumExp, proposeFromPoint, takeProposal, type Proposal } from "./proposal";
import { mergeKeepsGoing } from "./termination";

/** Buffers of one recursion level; a subtree of depth d uses level d (one frame per depth). */
interface SubtreeFrame {
  readonly rhoInit: Float64Array;
  readonly rhoFinal: Float64Array;
  readonly pInitEnd: Float64Array;
  readonly vInitEnd: Float64Array;
  readonly pFinalBegin: Float64Array;
  readonly vFinalBegin: Float64Array;
  readonly proposalFinal: Proposal;
}

/**
 * Builds subtrees of a NUTS trajectory by repeated doubling with multinomial sampling
 * (Betancourt 2017, arXiv:1701.02434, §A.3) and the U-turn checks of Stan's base_nuts
 * (whole subtree plus both one-point extensions across its halves). All buffers are
 * allocated once; a leapfrog step allocates nothing.
 */
export class TrajectoryBuilder {
  readonly dimension: number;
  private readonly frames: SubtreeFrame[] = [];

  // Per-transition context, set by `begin`.
  private readonly model: DensityModel;
  private rng: RandomSource | undefined;
  private inverseMetric: Float64Array;
  private stepSize = 0;
  private initialEnergy = 0;
  private maxEnergyError = 1000;

  /** Leapfrog steps taken since `begin`. */
  leapfrogSteps = 0;
  /** Σ min(1, exp(H0 − H)) over every leapfrog point since `begin`. */
  sumAcceptProbability = 0;
  /** True once a leapfrog point had energy error above the limit. */
  divergent = false;
  /** log Σ exp(H0 − H) over the subtree most recently built. */
  subtreeLogWeight = Number.NEGATIVE_INFINITY;
  /** Position of the leapfrog point whose energy error first exceeded the limit (valid while `divergent`). */
  readonly divergencePoint: Float64Array;

  constructor(model: DensityModel, maxTreeDepth: number) {
    this.model = model;
    this.dimension = model.dimension;
    this.inverseMetric = new Float64Array(model.dimension);
    this.divergencePoint = new Float64Array(model.dimension);
    for (let depth = 0; depth < maxTreeDepth; depth++) {
      const n = model.dimension;
      this.frames.push({
        rhoInit: new Float64Array(n),
        rhoFinal: new Float64Array(n),
        pInitEnd: new Float64Array(n),
        vInitEnd: new Float64Array(n),
        pFinalBegin: new Float64Array(n),
        vFinalBegin: new Float64Array(n),
        proposalFinal: createProposal(n),
      });
    }
  }

  get maxTreeDepth(): number {
    return this.frames.length;
  }

  begin(rng: RandomSource, inverseMetric: Float64Array, stepSize: number, initialEnergy: number, maxEnergyError: number): void {
    this.rng = rng;
    this.inverseMetric = inverseMetric;
    this.stepSize = stepSize;
    this.initialEnergy = initialEnergy;
    this.maxEnergyError = maxEnergyError;
    this.leapfrogSteps = 0;
    this.sumAcceptProbability = 0;
    this.divergent = false;
  }

  /**
   * Extends the trajectory from `z` by 2^depth leapfrog steps in direction `sign`.
   * Writes the subtree's proposal, summed momentum `rho`, and momenta/velocities at its
   * first (`pBegin`, `vBegin`) and last (`pEnd`, `vEnd`) points; sets `subtreeLogWeight`.
   * Returns false when the subtree diverged or made a U-turn (then it must be discarded).
   */
  build(
    depth: number,
    z: PhasePoint,
    proposal: Proposal,
    vBegin: Float64Array,
    vEnd: Float64Array,
    rho: Float64Array,
    pBegin: Float64Array,
    pEnd: Float64Array,
    sign: number,
  ): boolean {
    if (depth === 0) {
      if (!this.leaf(z, sign)) return false;
      proposeFromPoint(z, proposal);
      rho.set(z.p);
      pBegin.set(z.p);
      pEnd.set(z.p);
      vBegin.set(z.v);
      vEnd.set(z.v);
      return true;
    }
    if (depth === 1) return this.buildPair(z, proposal, vBegin, vEnd, rho, pBegin, pEnd, sign);

    const frame = this.frames[depth]!;
    if (!this.build(depth - 1, z, proposal, vBegin, frame.vInitEnd, frame.rhoInit, pBegin, frame.pInitEnd, sign)) return false;
    const logWeightInit = this.subtreeLogWeight;
    if (!this.build(depth - 1, z, frame.proposalFinal, frame.vFinalBegin, vEnd, frame.rhoFinal, frame.pFinalBegin, pEnd, sign)) {
      return false;
    }
    const logWeightFinal = this.subtreeLogWeight;
    const logWeight = logSumExp(logWeightInit, logWeightFinal);
    this.subtreeLogWeight = logWeight;

    // Multinomial choice between the two halves' proposals (Betancourt 2017, §A.3.2).
    if (logWeightFinal > logWeight || this.rng!.uniform() < Math.exp(logWeightFinal - logWeight)) {
      takeProposal(frame.proposalFinal, proposal);
    }

    return mergeKeepsGoing(
      frame.rhoInit,
      frame.rhoFinal,
      rho,
      vBegin,
      vEnd,
      frame.pInitEnd,
      frame.vInitEnd,
      frame.pFinalBegin,
      frame.vFinalBegin,
      true,
    );
  }

  /** One leapfrog step from `z`; records its weight and acceptance. False if it diverged. */
  private leaf(z: PhasePoint, sign: number): boolean {
    leapfrog(this.model, z, this.inverseMetric, sign * this.stepSize);
    this.leapfrogSteps++;
    let energy = z.kinetic - z.logDensity;
    if (Number.isNaN(energy)) energy = Number.POSITIVE_INFINITY;
    if (energy - this.initialEnergy > this.maxEnergyError) {
      this.divergent = true;
      this.divergencePoint.set(z.q);
    }
    const logWeight = this.initialEnergy - energy;
    this.subtreeLogWeight = logWeight;
    this.sumAcceptProbability += logWeight > 0 ? 1 : Math.exp(logWeight);
    return !this.divergent;
  }

  /**
   * A depth-1 subtree (two leapfrog steps), the most frequent case, with the same result as
   * the general recursion but fewer copies: the second point is copied only if it is drawn,
   * and ρ and the U-turn check come out of one sweep (for two points the cross checks of the
   * general case coincide with the plain one).
   */
  private buildPair(
    z: PhasePoint,
    proposal: Proposal,
    vBegin: Float64Array,
    vEnd: Float64Array,
    rho: Float64Array,
    pBegin: Float64Array,
    pEnd: Float64Array,
    sign: number,
  ): boolean {
    if (!this.leaf(z, sign)) return false;
    const logWeightFirst = this.subtreeLogWeight;
    proposeFromPoint(z, proposal);
    pBegin.set(z.p);
    vBegin.set(z.v);
    if (!this.leaf(z, sign)) return false;
    const logWeightSecond = this.subtreeLogWeight;
    const logWeight = logSumExp(logWeightFirst, logWeightSecond);
    this.subtreeLogWeight = logWeight;
    if (logWeightSecond > logWeight || this.rng!.uniform() < Math.exp(logWeightSecond - logWeight)) proposeFromPoint(z, proposal);
    const { p, v } = z;
    let begin = 0;
    let end = 0;
    for (let i = 0; i < rho.length; i++) {
      const pi = p[i]!;
      const vi = v[i]!;
      const r = pBegin[i]! + pi;
      rho[i] = r;
      pEnd[i] = pi;
      vEnd[i] = vi;
      begin += vBegin[i]! * r;
      end += vi * r;
    }
    return begin > 0 && end > 0;
  }
}
