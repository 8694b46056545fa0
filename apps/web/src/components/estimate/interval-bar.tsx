// A posterior interval drawn small, on a log axis shared by every bar of a table or grid
// so that bars can be compared: a line for the 90 % interval, a dot for the median.

export type LogDomain = readonly [number, number];

/** A log-scale domain that holds every interval given, padded a little; null when none is positive. */
export function logDomainOf(values: readonly (number | null | undefined)[]): LogDomain | null {
  let lo = Infinity;
  let hi = -Infinity;
  for (const value of values) {
    if (value === null || value === undefined || !(value > 0) || !Number.isFinite(value)) continue;
    lo = Math.min(lo, value);
    hi = Math.max(hi, value);
  }
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) return null;
  if (lo === hi) return [lo / 2, hi * 2];
  const pad = (Math.log(hi) - Math.log(lo)) * 0.04;
  return [Math.exp(Math.log(lo) - pad), Math.exp(Math.log(hi) + pad)];
}

/** Where a value sits on the domain, 0–1 (clamped). */
export function logPosition(value: number, [lo, hi]: LogDomain): number {
  if (!(value > 0)) return 0;
  const t = (Math.log(value) - Math.log(lo)) / (Math.log(hi) - Math.log(lo));
  return Math.min(1, Math.max(0, t));
}

type IntervalBarProps = {
  median: number;
  low: number;
  high: number;
  domain: LogDomain;
  /** A reference value drawn as a thin upright line (e.g. the customer value). */
  reference?: number | null;
  /** Lighter look for an estimate that is not the headline one (e.g. no pooling). */
  tone?: "pooled" | "unpooled";
  className?: string;
};

const pct = (share: number) => `${(share * 100).toFixed(2)}%`;

export function IntervalBar({ median, low, high, domain, reference = null, tone = "pooled", className = "" }: IntervalBarProps) {
  const from = logPosition(low, domain);
  const to = logPosition(high, domain);
  const mid = logPosition(median, domain);
  const lineColour = tone === "pooled" ? "bg-stream-700" : "bg-ink-400";
  const dotColour = tone === "pooled" ? "bg-stream-800 border-white" : "bg-surface border-ink-600";
  return (
    <span className={`relative block h-3 ${className}`} aria-hidden="true" data-interval={`${low}|${median}|${high}`}>
      <span className="absolute inset-x-0 top-1/2 h-px -translate-y-1/2 bg-ink-100" />
      {reference !== null && reference > 0 ? (
        <span className="absolute top-0 h-3 w-0.5 -translate-x-1/2 bg-silt-500" style={{ left: pct(logPosition(reference, domain)) }} data-reference="" />
      ) : null}
      <span className={`absolute top-1/2 h-1 -translate-y-1/2 rounded-full ${lineColour}`} style={{ left: pct(from), width: pct(Math.max(to - from, 0.004)) }} />
      <span className={`absolute top-1/2 h-2.5 w-2.5 -translate-x-1/2 -translate-y-1/2 rounded-full border ${dotColour}`} style={{ left: pct(mid) }} />
    </span>
  );
}
