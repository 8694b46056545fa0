import type { DensityModel } from "../model/density-model";
import type { RandomSource } from "../rng/random-source";
import { sampleMomentum } from "./metric";
import { copyPhasePoint, createPhasePoint, type PhasePoint } from "./phase-point";
import { createProposal, logSumExp, takeProposal, type Proposal } from "./proposal";
import { mergeKeepsGoing } from "./termination";
import { TrajectoryBuilder } from "./trajectory";

/** Where a chain is: position on the unconstrained scale, its log density and gradient. */
export interface NutsState {
  readonly position: Float64Array;
  readonly gradient: Float64Array;
  logDensity: number;
}

export interface NutsSettings {
  stepSize: number;
  /** Diagonal of the inverse mass matrix (length = dimension). */
  inverseMetric: Float64Array;
  /** Maximum number of trajectory doublings (Stan's max_treedepth). */
  maxTreeDepth: number;
  /** Energy error above which a transition is divergent; 1000 as in Stan. */
  maxEnergyError?: number;
}

export interface NutsInfo {
  treeDepth: number;
  leapfrogSteps: number;
  divergent: boolean;
  /** Hamiltonian at the selected point (used for E-BFMI). */
  energy: number;
  /** Mean of min(1, exp(H0 − H)) over all leapfrog points of the trajectory. */
  acceptStat: number;
}

export function createNutsState(dimension: number): NutsState {
  return { position: new Float64Array(dimension), gradient: new Float64Array(dimension), logDensity: Number.NEGATIVE_INFINITY };
}

export function createNutsInfo(): NutsInfo {
  return { treeDepth: 0, leapfrogSteps: 0, divergent: false, energy: 0, acceptStat: 0 };
}

/** Buffers for the transitions of one chain, allocated once. */
export class NutsWorkspace {
  readonly model: DensityModel;
  readonly builder: TrajectoryBuilder;
  readonly forwardEnd: PhasePoint;
  readonly backwardEnd: PhasePoint;
  readonly rho: Float64Array;
  readonly rhoNew: Float64Array;
  readonly pForward: Float64Array;
  readonly vForward: Float64Array;
  readonly pBackward: Float64Array;
  readonly vBackward: Float64Array;
  readonly pNewBegin: Float64Array;
  readonly vNewBegin: Float64Array;
  readonly pNewEnd: Float64Array;
  readonly vNewEnd: Float64Array;
  readonly proposalNew: Proposal;
  readonly selected: Proposal;

  constructor(model: DensityModel, maxTreeDepth: number) {
    if (!Number.isInteger(maxTreeDepth) || maxTreeDepth < 1 || maxTreeDepth > 30) {
      throw new Error(`maxTreeDepth must be an integer from 1 to 30, got ${String(maxTreeDepth)}`);
    }
    const n = model.dimension;
    this.model = model;
    this.builder = new TrajectoryBuilder(model, maxTreeDepth);
    this.forwardEnd = createPhasePoint(n);
    this.backwardEnd = createPhasePoint(n);
    this.rho = new Float64Array(n);
    this.rhoNew = new Float64Array(n);
    this.pForward = new Float64Array(n);
    this.vForward = new Float64Array(n);
    this.pBackward = new Float64Array(n);
    this.vBackward = new Float64Array(n);
    this.pNewBegin = new Float64Array(n);
    this.vNewBegin = new Float64Array(n);
    this.pNewEnd = new Float64Array(n);
    this.vNewEnd = new Float64Array(n);
    this.proposalNew = createProposal(n);
    this.selected = createProposal(n);
  }
}

/**
 * One NUTS transition (Hoffman & Gelman 2014, JMLR 15; multinomial sampling and the
 * generalised U-turn criterion of Betancourt 2017, arXiv:1701.02434; structure of Stan's
 * base_nuts transition). A pure step: reads `state`, draws only from `rng`, writes the new
 * state into `next` (which may be the same object as `state`) and the diagnostics into `info`.
 *
 * Unlike Stan 2.21+, whose top-level cross checks pair the new subtree with the old
 * forward subtree's first point, the one-point extensions here use the old trajectory's
 * end that is adjacent to the new subtree, as the criterion intends.
 */
export function nutsTransition(
  workspace: NutsWorkspace,
  state: NutsState,
  rng: RandomSource,
  settings: NutsSettings,
  next: NutsState,
  info: NutsInfo,
): void {
  const { builder, forwardEnd, backwardEnd, rho, rhoNew, pNewBegin, vNewBegin, pNewEnd, vNewEnd, proposalNew, selected } = workspace;
  const { inverseMetric, stepSize } = settings;
  const maxTreeDepth = Math.min(settings.maxTreeDepth, builder.maxTreeDepth);

  forwardEnd.q.set(state.position);
  forwardEnd.grad.set(state.gradient);
  forwardEnd.logDensity = state.logDensity;
  sampleMomentum(rng, inverseMetric, forwardEnd.p);
  let twiceKinetic = 0;
  for (let i = 0; i < forwardEnd.p.length; i++) {
    const v = inverseMetric[i]! * forwardEnd.p[i]!;
    forwardEnd.v[i] = v;
    twiceKinetic += v * forwardEnd.p[i]!;
  }
  forwardEnd.kinetic = 0.5 * twiceKinetic;
  copyPhasePoint(forwardEnd, backwardEnd);

  const energy0 = forwardEnd.kinetic - state.logDensity;
  selected.q.set(state.position);
  selected.grad.set(state.gradient);
  selected.logDensity = state.logDensity;
  selected.kinetic = forwardEnd.kinetic;

  rho.set(forwardEnd.p);
  workspace.pForward.set(forwardEnd.p);
  workspace.pBackward.set(forwardEnd.p);
  workspace.vForward.set(forwardEnd.v);
  workspace.vBackward.set(forwardEnd.v);

  builder.begin(rng, inverseMetric, stepSize, energy0, settings.maxEnergyError ?? 1000);
  let logSumWeight = 0;
  let depth = 0;

  while (depth < maxTreeDepth) {
    const forward = rng.uniform() > 0.5;
    const z = forward ? forwardEnd : backwardEnd;
    const valid = builder.build(depth, z, proposalNew, vNewBegin, vNewEnd, rhoNew, pNewBegin, pNewEnd, forward ? 1 : -1);
    if (!valid) break;
    depth++;

    // Biased progressive sampling towards the new subtree (Betancourt 2017, §A.3.2).
    const logWeightNew = builder.subtreeLogWeight;
    if (logWeightNew > logSumWeight || rng.uniform() < Math.exp(logWeightNew - logSumWeight)) {
      takeProposal(proposalNew, selected);
    }
    logSumWeight = logSumExp(logSumWeight, logWeightNew);

    const pNear = forward ? workspace.pForward : workspace.pBackward;
    const vNear = forward ? workspace.vForward : workspace.vBackward;
    const vFar = forward ? workspace.vBackward : workspace.vForward;
    // Old trajectory and new subtree as two adjacent halves, ordered along the direction of travel
    // for forward extensions and against it for backward ones (the checks are symmetric).
    const keepGoing = forward
      ? mergeKeepsGoing(rho, rhoNew, rho, vFar, vNewEnd, pNear, vNear, pNewBegin, vNewBegin, true)
      : mergeKeepsGoing(rhoNew, rho, rho, vNewEnd, vFar, pNewBegin, vNewBegin, pNear, vNear, true);
    pNear.set(pNewEnd);
    vNear.set(vNewEnd);
    if (!keepGoing) break;
  }

  next.position.set(selected.q);
  next.gradient.set(selected.grad);
  next.logDensity = selected.logDensity;
  info.treeDepth = depth;
  info.leapfrogSteps = builder.leapfrogSteps;
  info.divergent = builder.divergent;
  info.energy = selected.kinetic - selected.logDensity;
  info.acceptStat = builder.sumAcceptProbability / builder.leapfrogSteps;
}
