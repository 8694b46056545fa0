type MarkProps = { className?: string; tone?: "light" | "dark" };

/** Three streams joining one river: many cells, one pooled portfolio. */
export function TributaryMark({ className, tone = "dark" }: MarkProps) {
  const river = tone === "dark" ? "var(--color-ink-50)" : "var(--color-ink-900)";
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden="true" focusable="false">
      <g fill="none" strokeLinecap="round" strokeWidth="3">
        <path d="M6 4c0 8 10 8 10 15" stroke="var(--color-series-5)" />
        <path d="M26 4c0 8-10 8-10 15" stroke="var(--color-series-2)" />
        <path d="M16 4v24" stroke={river} />
      </g>
    </svg>
  );
}

export function Wordmark({ tone = "dark", className = "" }: { tone?: "light" | "dark"; className?: string }) {
  return (
    <span className={`inline-flex items-center gap-2 ${className}`}>
      <TributaryMark className="h-7 w-7 shrink-0" tone={tone} />
      <span
        className={`text-heading font-semibold tracking-tight ${tone === "dark" ? "text-ink-50" : "text-ink-900"}`}
      >
        Tributary
      </span>
    </span>
  );
}
