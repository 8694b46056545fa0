/** Decorative: four streams meeting in one river, drawn behind the sign-in panel. */
export function ConfluenceArt({ className = "" }: { className?: string }) {
  const streams = [
    { d: "M30 0C50 170 200 230 240 380", colour: "var(--color-series-5)", width: 5 },
    { d: "M150 0C165 150 225 250 240 380", colour: "var(--color-series-2)", width: 4 },
    { d: "M310 0C295 160 252 260 240 380", colour: "var(--color-series-3)", width: 4 },
    { d: "M470 0C440 190 285 270 240 380", colour: "var(--color-ink-400)", width: 5 },
  ];
  return (
    <svg viewBox="0 0 480 680" preserveAspectRatio="xMidYMid slice" className={className} aria-hidden="true" focusable="false">
      <g fill="none" strokeLinecap="round">
        {streams.map((stream) => (
          <path key={stream.d} d={stream.d} stroke={stream.colour} strokeWidth={stream.width} opacity="0.55" />
        ))}
        <path d="M240 380C240 500 300 590 380 680" stroke="var(--color-ink-200)" strokeWidth="16" opacity="0.3" />
      </g>
    </svg>
  );
}
