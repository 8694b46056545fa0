/** Thrown by fitPortfolio when its signal aborts: the fit stopped and there is no result. */
export class FitCancelledError extends Error {
  constructor(message = "The fit was cancelled before it finished.") {
    super(message);
    this.name = "FitCancelledError";
  }
}

export function isFitCancelled(error: unknown): error is FitCancelledError {
  return error instanceof FitCancelledError;
}
