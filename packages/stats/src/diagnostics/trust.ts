export interface TrustThresholds {
  /** Largest acceptable R-hat; 1.01 (Vehtari et al. 2021, §4.2 recommendation). */
  maxRhat: number;
  /** Smallest acceptable bulk ESS; 400 (Vehtari et al. 2021, §4.3: 100 per chain for 4 chains). */
  minEssBulk: number;
  /** Largest acceptable number of post-warm-up divergences; 0 (Betancourt 2017, §6.2). */
  maxDivergences: number;
}

export const defaultTrustThresholds: Readonly<TrustThresholds> = Object.freeze({ maxRhat: 1.01, minEssBulk: 400, maxDivergences: 0 });

export interface TrustInput {
  rhat: readonly { name: string; value: number }[];
  essBulk: readonly { name: string; value: number }[];
  divergences: number;
  draws: number;
  cancelled: boolean;
  /**
   * Target acceptance of the step-size adaptation in the run that produced these draws
   * (the lowest over the runs that diverged, when several are judged together); the advice
   * on divergences depends on it. Unknown when absent.
   */
  targetAcceptance?: number;
}

/** Target acceptance from which a higher one is no longer the first advice on divergences (the inference defaults' retry value). */
export const HIGH_TARGET_ACCEPTANCE = 0.9;

/** Applies the trust rule and explains each failure in words a person can act on. */
export function assessTrust(input: TrustInput, thresholds: TrustThresholds = defaultTrustThresholds): { trustworthy: boolean; reasons: string[] } {
  const reasons: string[] = [];
  if (input.cancelled) reasons.push("The run was stopped before it finished, so its draws are incomplete.");
  if (input.draws === 0) reasons.push("The run has no post-warm-up draws.");

  const badRhat = input.rhat.filter((r) => !(r.value <= thresholds.maxRhat) && !Number.isNaN(r.value));
  if (badRhat.length > 0) {
    const worst = badRhat.reduce((a, b) => (b.value > a.value ? b : a));
    reasons.push(
      `R-hat is above ${thresholds.maxRhat} for ${plural(badRhat.length, "parameter")} (worst: ${worst.name} at ${worst.value.toFixed(3)}): ` +
        "the chains have not converged to the same distribution; run longer or reparameterise.",
    );
  }
  const lowEss = input.essBulk.filter((e) => !(e.value >= thresholds.minEssBulk) && !Number.isNaN(e.value));
  if (lowEss.length > 0) {
    const worst = lowEss.reduce((a, b) => (b.value < a.value ? b : a));
    reasons.push(
      `Bulk ESS is below ${thresholds.minEssBulk} for ${plural(lowEss.length, "parameter")} (lowest: ${worst.name} at ${Math.round(worst.value)}): ` +
        "too few effectively independent draws for stable estimates; run more iterations.",
    );
  }
  if (input.divergences > thresholds.maxDivergences) {
    const target = input.targetAcceptance;
    const advice =
      target !== undefined && target >= HIGH_TARGET_ACCEPTANCE
        ? `the run already used target acceptance ${target}, so a smaller step did not remove them; what remains: ` +
          "a longer warm-up, a check of the flagged cells' data (candidate outliers, very short series, spend that barely varies), " +
          "or fewer pooling levels."
        : `raise the target acceptance (e.g. ${HIGH_TARGET_ACCEPTANCE}${target !== undefined ? `; this run used ${target}` : ""}) or reparameterise.`;
    reasons.push(
      `${plural(input.divergences, "divergent transition")} after warm-up: the sampler could not follow the posterior's geometry, ` +
        `so estimates may be biased; ${advice}`,
    );
  }
  return { trustworthy: reasons.length === 0, reasons };
}

function plural(count: number, noun: string): string {
  return `${count} ${noun}${count === 1 ? "" : "s"}`;
}
