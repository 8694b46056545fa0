/**
 * Step-size adaptation by dual averaging (Hoffman & Gelman 2014, JMLR 15, §3.2.1, after
 * Nesterov 2009), with Stan's defaults γ = 0.05, t0 = 10, κ = 0.75 and μ = log(10 ε0).
 * As {init, update, final} over plain state; `update` mutates and returns the state.
 */
export interface DualAveragingState {
  iteration: number;
  /** Running average of (target − accept stat), Stan's s_bar. */
  gradientAverage: number;
  /** Averaged log step size, Stan's x_bar. */
  logStepSizeAverage: number;
  /** Shrinkage point μ. */
  mu: number;
  /** Step size to use for the next iteration. */
  stepSize: number;
}

export interface DualAveragingSettings {
  targetAcceptance: number;
  gamma?: number;
  t0?: number;
  kappa?: number;
}

export const dualAveraging = {
  init(initialStepSize: number): DualAveragingState {
    return { iteration: 0, gradientAverage: 0, logStepSizeAverage: 0, mu: Math.log(10 * initialStepSize), stepSize: initialStepSize };
  },

  update(state: DualAveragingState, acceptStat: number, settings: DualAveragingSettings): DualAveragingState {
    const gamma = settings.gamma ?? 0.05;
    const t0 = settings.t0 ?? 10;
    const kappa = settings.kappa ?? 0.75;
    const accept = acceptStat > 1 ? 1 : acceptStat;
    state.iteration += 1;
    const t = state.iteration;
    const eta = 1 / (t + t0);
    state.gradientAverage = (1 - eta) * state.gradientAverage + eta * (settings.targetAcceptance - accept);
    const logStepSize = state.mu - (state.gradientAverage * Math.sqrt(t)) / gamma;
    const weight = Math.pow(t, -kappa);
    state.logStepSizeAverage = (1 - weight) * state.logStepSizeAverage + weight * logStepSize;
    state.stepSize = Math.exp(logStepSize);
    return state;
  },

  /** The step size to keep after warm-up: exp of the averaged log step size. */
  final(state: DualAveragingState): number {
    return state.iteration > 0 ? Math.exp(state.logStepSizeAverage) : state.stepSize;
  },
};
