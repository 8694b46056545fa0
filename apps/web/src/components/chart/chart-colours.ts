// Chart colours come from the design tokens (src/styles/tokens.css). SVG attributes cannot
// hold var(), so the values are read from the document once it has its styles.

function token(name: string): string {
  if (typeof document === "undefined") return "currentColor";
  const value = getComputedStyle(document.documentElement).getPropertyValue(name).trim();
  return value === "" ? "currentColor" : value;
}

/** The categorical palette, in order (8 colours, colour-blind safe; pair with labels). */
export function seriesColours(): string[] {
  return Array.from({ length: 8 }, (_, i) => token(`--color-series-${i + 1}`));
}

export function seriesColour(index: number): string {
  const palette = seriesColours();
  return palette[index % palette.length] ?? "currentColor";
}

export type ChartToken =
  | "ink-900"
  | "ink-700"
  | "ink-600"
  | "ink-500"
  | "ink-400"
  | "ink-300"
  | "ink-200"
  | "ink-100"
  | "stream-800"
  | "stream-700"
  | "stream-500"
  | "stream-200"
  | "stream-100"
  | "silt-700"
  | "silt-500"
  | "silt-300"
  | "caution-700"
  | "alert-700";

export function tokenColour(name: ChartToken): string {
  return token(`--color-${name}`);
}
