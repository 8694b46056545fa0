// The badge an analyst's flag puts on a cell × channel, on every screen that shows it.
// Each kind has its own small shape as well as its words, so it reads without colour.
import { flagKindLabels, type FlagKind } from "@tributary/contracts";

/** Few words for tight places (a grid cell, a chart's margin). */
export const flagKindShortLabels: Record<FlagKind, string> = {
  data_problem: "data problem",
  real_difference: "real difference",
  needs_lift_test: "lift test",
};

const tones: Record<FlagKind, string> = {
  data_problem: "border-alert-700/40 bg-alert-100 text-alert-700",
  real_difference: "border-stream-600/40 bg-stream-50 text-stream-800",
  needs_lift_test: "border-silt-500/60 bg-caution-100 text-caution-700",
};

/** A square with a slash (data problem), two offset bars (real difference), a diamond with a dot (needs a test). */
export function FlagGlyph({ kind }: { kind: FlagKind }) {
  return (
    <svg viewBox="0 0 12 12" className="h-3 w-3 shrink-0" aria-hidden="true" data-flag-glyph={kind}>
      {kind === "data_problem" ? (
        <>
          <rect x="1.5" y="1.5" width="9" height="9" rx="1" fill="none" stroke="currentColor" strokeWidth="1.4" />
          <path d="M3 9 9 3" stroke="currentColor" strokeWidth="1.4" strokeLinecap="round" />
        </>
      ) : kind === "real_difference" ? (
        <>
          <path d="M1.5 4h6" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
          <path d="M4.5 8h6" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
        </>
      ) : (
        <>
          <path d="M6 1 11 6 6 11 1 6Z" fill="none" stroke="currentColor" strokeWidth="1.4" strokeLinejoin="round" />
          <circle cx="6" cy="6" r="1.4" fill="currentColor" />
        </>
      )}
    </svg>
  );
}

type FlagBadgeProps = {
  kind: FlagKind;
  /** The channel the flag is on, when the badge sits on a cell that shows several channels. */
  channel?: string;
  /** Who flagged it and why, shown on hover. */
  title?: string;
  /** Only the glyph (the words go into the accessible name). */
  compact?: boolean;
  /** The glyph and a word or two: the channel when given, else the kind (the full words go into the accessible name). */
  short?: boolean;
};

export function FlagBadge({ kind, channel, title, compact = false, short = false }: FlagBadgeProps) {
  const words = `Flagged: ${flagKindLabels[kind].toLowerCase()}${channel ? ` (${channel})` : ""}`;
  const labelled = compact || short;
  return (
    <span
      className={`inline-flex items-center gap-1 whitespace-nowrap rounded-sm border px-1.5 py-px text-caption font-medium ${tones[kind]}`}
      title={title ?? words}
      data-flag={kind}
      {...(labelled ? { role: "img", "aria-label": words } : {})}
    >
      <FlagGlyph kind={kind} />
      {compact ? null : short ? <span aria-hidden="true">{channel ?? flagKindShortLabels[kind]}</span> : <span>{words}</span>}
    </span>
  );
}
