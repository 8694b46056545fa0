// Small helpers that keep messages readable whatever the input holds.

const MAX_QUOTED_LENGTH = 40;

/** A value quoted for a message: control characters made visible, long values shortened. */
export function quoteValue(value: string): string {
  const visible = value.replace(/[\u0000-\u001f\u007f]/g, (ch) => `\\u${ch.charCodeAt(0).toString(16).padStart(4, "0")}`);
  const chars = Array.from(visible);
  const shown = chars.length > MAX_QUOTED_LENGTH ? `${chars.slice(0, MAX_QUOTED_LENGTH).join("")}… (${chars.length} characters)` : visible;
  return `"${shown}"`;
}

/** A number for a message: at most 6 significant digits, thousands separated. */
export function formatNumber(value: number): string {
  if (!Number.isFinite(value)) return String(value);
  const rounded = Number(value.toPrecision(6));
  if (Math.abs(rounded) >= 1e15) return rounded.toExponential(3);
  const [whole = "", fraction] = Math.abs(rounded).toString().split(".");
  const grouped = whole.replace(/\B(?=(\d{3})+(?!\d))/g, ",");
  return `${rounded < 0 ? "-" : ""}${grouped}${fraction ? `.${fraction}` : ""}`;
}

/** "1 week" / "3 weeks". */
export function plural(count: number, noun: string, nouns = `${noun}s`): string {
  return `${formatNumber(count)} ${count === 1 ? noun : nouns}`;
}

/** "a, b and c". */
export function listWords(words: readonly string[]): string {
  if (words.length <= 1) return words.join("");
  return `${words.slice(0, -1).join(", ")} and ${words[words.length - 1]}`;
}
