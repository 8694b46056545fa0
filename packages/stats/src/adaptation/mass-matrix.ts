/**
 * Diagonal mass-matrix estimation for one slow warm-up window: Welford's running
 * variance (Welford 1962, Technometrics 4(3)) of the positions, regularised towards
 * 1e-3 as in Stan's var_adaptation: (n/(n+5))·σ² + 1e-3·5/(n+5).
 * As {init, update, final} over plain state; `update` mutates and returns the state.
 */
export interface MassMatrixState {
  count: number;
  readonly mean: Float64Array;
  readonly sumSquares: Float64Array;
}

export const diagonalMassMatrix = {
  init(dimension: number): MassMatrixState {
    return { count: 0, mean: new Float64Array(dimension), sumSquares: new Float64Array(dimension) };
  },

  update(state: MassMatrixState, position: Float64Array): MassMatrixState {
    state.count += 1;
    const n = state.count;
    const { mean, sumSquares } = state;
    for (let i = 0; i < mean.length; i++) {
      const delta = position[i]! - mean[i]!;
      mean[i] = mean[i]! + delta / n;
      sumSquares[i] = sumSquares[i]! + (position[i]! - mean[i]!) * delta;
    }
    return state;
  },

  /** Writes the regularised inverse metric (variances) into `out` and resets the window. */
  final(state: MassMatrixState, out: Float64Array): void {
    const n = state.count;
    if (n < 2) throw new Error("a mass-matrix window needs at least 2 draws");
    const shrink = n / (n + 5);
    const prior = 1e-3 * (5 / (n + 5));
    for (let i = 0; i < out.length; i++) out[i] = shrink * (state.sumSquares[i]! / (n - 1)) + prior;
    state.count = 0;
    state.mean.fill(0);
    state.sumSquares.fill(0);
  },
};
