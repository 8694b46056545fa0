// Our glyph for how far partial pooling moved an estimate: a short track from the cell's
// own (no-pooling) estimate, a tick on the left, to the portfolio group, a ring on the
// right; a solid bar runs from the tick to where the pooled estimate landed.
// Shrinkage outside 0–1 (moved away from the group, or past it) shows a chevron past the
// track's end instead of being clipped silently (model.md, "Shrinkage and outliers").

const TRACK_START = 9;
const TRACK_END = 39;
const TRACK = TRACK_END - TRACK_START;
// How far past either end a bar may run; beyond 0–1 a chevron says so.
const OVERHANG = 5;

export type ShrinkagePlacement = {
  /** Where the pooled estimate sits on the track, in glyph units. */
  position: number;
  /** Which side of 0–1 the shrinkage lies on, if outside: away from the group, or past it. */
  beyond: "none" | "away" | "past";
};

/** Placement of the bar's end for a shrinkage value (0 = not moved, 1 = all the way to the group). */
export function shrinkagePlacement(shrinkage: number): ShrinkagePlacement {
  const raw = TRACK_START + shrinkage * TRACK;
  const position = Math.min(TRACK_END + OVERHANG, Math.max(TRACK_START - OVERHANG, raw));
  return { position, beyond: shrinkage < 0 ? "away" : shrinkage > 1 ? "past" : "none" };
}

/** Shrinkage as a percentage with a true minus sign: −0.04 → "−4 %". */
export function formatShrinkage(shrinkage: number): string {
  return `${Math.round(shrinkage * 100)} %`.replace("-", "−");
}

/** The shrinkage in words, for the accessible name and the tooltip. */
export function describeShrinkage(shrinkage: number | null): string {
  if (shrinkage === null || !Number.isFinite(shrinkage)) return "Shrinkage not defined (no comparison, or the cell's own estimate equals the group's)";
  const percent = formatShrinkage(shrinkage);
  if (shrinkage < 0) return `Pooling moved the estimate away from the group (shrinkage ${percent})`;
  if (shrinkage > 1) return `Pooling moved the estimate past the group (shrinkage ${percent})`;
  if (Math.round(shrinkage * 100) === 0) return "Pooling hardly moved the estimate (shrinkage 0 %)";
  return `Pooling moved the estimate ${percent} of the way from the cell's own data to the group`;
}

type ShrinkageMarkProps = {
  shrinkage: number | null;
  /** Also write the percentage beside the glyph. */
  withValue?: boolean;
  /** Words instead of the default description (e.g. naming the channel). */
  label?: string;
  className?: string;
};

export function ShrinkageMark({ shrinkage, withValue = false, label: givenLabel, className = "" }: ShrinkageMarkProps) {
  const label = givenLabel ?? describeShrinkage(shrinkage);
  const defined = shrinkage !== null && Number.isFinite(shrinkage);
  const placement = defined ? shrinkagePlacement(shrinkage) : null;
  return (
    <span className={`inline-flex items-center gap-1 whitespace-nowrap ${className}`} title={label}>
      <svg
        viewBox="0 0 48 12"
        className="h-3 w-12 shrink-0 text-stream-700"
        role="img"
        aria-label={label}
        data-shrinkage={defined ? shrinkage.toFixed(3) : "undefined"}
        data-beyond={placement?.beyond ?? "undefined"}
      >
        {/* The track, from the cell's own estimate (tick) to the group (ring). */}
        <line x1={TRACK_START} y1="6" x2={TRACK_END} y2="6" stroke="var(--color-ink-300)" strokeWidth="1.2" strokeDasharray={defined ? undefined : "2 2"} />
        {placement ? <line x1={TRACK_START} y1="6" x2={placement.position} y2="6" stroke="currentColor" strokeWidth="3.2" strokeLinecap="round" /> : null}
        <line x1={TRACK_START} y1="2" x2={TRACK_START} y2="10" stroke="var(--color-ink-700)" strokeWidth="1.4" strokeLinecap="round" />
        <circle cx={TRACK_END} cy="6" r="2.6" fill="var(--color-surface)" stroke="var(--color-ink-700)" strokeWidth="1.3" />
        {placement?.beyond === "away" ? <path d="M3.6 2.5 0.8 6 3.6 9.5" fill="none" stroke="var(--color-caution-700)" strokeWidth="1.4" strokeLinecap="round" strokeLinejoin="round" /> : null}
        {placement?.beyond === "past" ? <path d="M44.4 2.5 47.2 6 44.4 9.5" fill="none" stroke="var(--color-caution-700)" strokeWidth="1.4" strokeLinecap="round" strokeLinejoin="round" /> : null}
      </svg>
      {withValue ? (
        <span className="text-caption tabular-nums text-ink-700" aria-hidden="true">
          {defined ? formatShrinkage(shrinkage) : "–"}
        </span>
      ) : null}
    </span>
  );
}
