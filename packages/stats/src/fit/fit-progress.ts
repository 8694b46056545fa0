/** Which of the two fits a progress report is about. */
export type FitModelLabel = "pooled" | "unpooled";

/**
 * Progress of one chain of a fit. For the no-pooling comparison the cells run one after
 * another, so `iteration` and `total` count over all cells of that chain, and `cell` is the
 * cell running now. `attempt` is 2 when the model is run again at a higher target acceptance.
 */
export interface FitProgress {
  readonly model: FitModelLabel;
  readonly chain: number;
  readonly iteration: number;
  readonly total: number;
  readonly phase: "warmup" | "sampling";
  /** Divergent transitions so far in the current phase (all cells so far, for the no-pooling fit). */
  readonly divergences: number;
  readonly attempt: number;
  /** No-pooling fit only: 0-based index of the cell running now, and the number of cells. */
  readonly cell?: number;
  readonly cellCount?: number;
}
