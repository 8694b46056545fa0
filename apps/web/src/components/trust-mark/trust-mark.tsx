// Our mark for whether a fit's numbers can be relied on. Shape, colour and words all
// carry the meaning, so it reads the same in greyscale and for every kind of colour vision.

export type TrustState = "trustworthy" | "untrustworthy" | "unassessed";

const labels: Record<TrustState, string> = {
  trustworthy: "Trustworthy",
  untrustworthy: "Not trustworthy",
  unassessed: "Not assessed yet",
};

const tones: Record<TrustState, string> = {
  trustworthy: "border-stream-600/40 bg-stream-50 text-stream-800",
  untrustworthy: "border-silt-500/60 bg-caution-100 text-caution-700",
  unassessed: "border-line-strong bg-ink-50 text-ink-700",
};

/** A river stone with a check (sound), a notched wedge with a bar (not sound), an open dashed ring (not known). */
function TrustGlyph({ state }: { state: TrustState }) {
  if (state === "trustworthy") {
    return (
      <svg viewBox="0 0 16 16" className="h-4 w-4 shrink-0" aria-hidden="true" data-glyph="stone">
        <path d="M8 1.2c3.9 0 6.8 2.6 6.8 6.6S11.9 14.8 8 14.8 1.2 11.8 1.2 7.8 4.1 1.2 8 1.2Z" fill="currentColor" />
        <path d="m4.9 8.2 2.2 2.2 4-4.4" fill="none" stroke="var(--color-white)" strokeWidth="1.8" strokeLinecap="round" strokeLinejoin="round" />
      </svg>
    );
  }
  if (state === "untrustworthy") {
    return (
      <svg viewBox="0 0 16 16" className="h-4 w-4 shrink-0" aria-hidden="true" data-glyph="wedge">
        <path d="M8 1.5 15 14H1Z" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinejoin="round" />
        <path d="M8 6v3.8" stroke="currentColor" strokeWidth="1.8" strokeLinecap="round" />
        <circle cx="8" cy="11.9" r="1" fill="currentColor" />
      </svg>
    );
  }
  return (
    <svg viewBox="0 0 16 16" className="h-4 w-4 shrink-0" aria-hidden="true" data-glyph="ring">
      <circle cx="8" cy="8" r="6" fill="none" stroke="currentColor" strokeWidth="1.6" strokeDasharray="2.6 2.2" />
    </svg>
  );
}

type TrustMarkProps = {
  state: TrustState;
  /** Shown after the label in smaller type, e.g. "3 reasons". */
  detail?: string;
  /** For a run published although it is not trustworthy: the publisher's written reason. */
  publishReason?: string | null;
  size?: "sm" | "md";
};

export function trustStateOf(trustworthy: boolean | null | undefined): TrustState {
  if (trustworthy === true) return "trustworthy";
  if (trustworthy === false) return "untrustworthy";
  return "unassessed";
}

export function TrustMark({ state, detail, publishReason, size = "sm" }: TrustMarkProps) {
  const padding = size === "md" ? "px-2.5 py-1 text-small" : "px-2 py-0.5 text-caption";
  return (
    <span className="inline-flex flex-col items-start gap-1">
      <span
        className={`inline-flex items-center gap-1.5 rounded-full border font-semibold ${padding} ${tones[state]}`}
        data-trust={state}
      >
        <TrustGlyph state={state} />
        <span>{labels[state]}</span>
        {detail ? <span className="font-normal">· {detail}</span> : null}
      </span>
      {state === "untrustworthy" && publishReason ? (
        <span className="max-w-xs text-caption text-ink-700">
          <span className="font-semibold">Published anyway:</span> “{publishReason}”
        </span>
      ) : null}
    </span>
  );
}
