/** Decorative: four streams meeting in one river, drawn behind the sign-in panel. */
export function ConfluenceArt({ className = "" }: { className?: string }) {
  const streams = [
    { d: "M130 0C140 150 265 215 310 330", colour: "var(--color-series-5)", width: 5 },
    { d: "M175 0C190 130 290 220 310 330", colour: "var(--color-series-2)", width: 4 },
    { d: "M330 0C320 140 305 230 310 330", colour: "var(--color-series-3)", width: 4 },
    { d: "M480 40C420 170 330 240 310 330", colour: "var(--color-ink-400)", width: 5 },
  ];
  return (
    <svg viewBox="0 0 480 680" preserveAspectRatio="xMidYMid slice" className={className} aria-hidden="true" focusable="false">
      <g fill="none" strokeLinecap="round">
        {streams.map((stream) => (
          <path key={stream.d} d={stream.d} stroke={stream.colour} strokeWidth={stream.width} opacity="0.55" />
        ))}
        <path d="M310 330C318 420 390 470 500 500" stroke="var(--color-ink-200)" strokeWidth="16" opacity="0.3" />
      </g>
    </svg>
  );
}
