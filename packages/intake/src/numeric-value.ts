/** Largest magnitude accepted for any number in an upload; beyond it a value is almost surely a typo. */
export const MAX_MAGNITUDE = 1e12;

export type NumberReading =
  | { readonly kind: "number"; readonly value: number }
  | { readonly kind: "missing" }
  | { readonly kind: "formula" }
  | { readonly kind: "not_finite" }
  | { readonly kind: "too_large"; readonly value: number }
  | { readonly kind: "not_a_number"; readonly hint: string };

// Plain decimal notation only: no hex, no thousands separators, no currency, no words.
const DECIMAL = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;
const NON_FINITE_WORDS = /^[+-]?(?:inf|infinity|nan|#num!|#div\/0!)$/i;
const SPREADSHEET_ERROR = /^#(?:n\/a|value!|ref!|name\?|null!|num!|div\/0!|spill!|calc!)$/i;
// Cells starting with these are run as formulas by spreadsheets (OWASP, "CSV Injection").
const FORMULA_START = /^[=+\-@]/;
const CURRENCY = /^[+-]?[$€£¥₹₩₽¤]|[$€£¥₹₩₽¤]$/;

/** Reads one cell as a number, strictly: what a spreadsheet would show, not what Number() guesses. */
export function readNumber(raw: string, maxMagnitude = MAX_MAGNITUDE): NumberReading {
  const text = raw.trim();
  if (text === "") return { kind: "missing" };
  if (DECIMAL.test(text)) {
    const value = Number(text);
    if (!Number.isFinite(value)) return { kind: "not_finite" };
    if (Math.abs(value) > maxMagnitude) return { kind: "too_large", value };
    // -0 would print as 0 but compare oddly; store plain zero.
    return { kind: "number", value: value === 0 ? 0 : value };
  }
  if (NON_FINITE_WORDS.test(text)) return { kind: "not_finite" };
  if (SPREADSHEET_ERROR.test(text)) return { kind: "not_a_number", hint: "it is a spreadsheet error value; fix the formula that produced it" };
  if (FORMULA_START.test(text)) return { kind: "formula" };
  if (CURRENCY.test(text)) return { kind: "not_a_number", hint: "remove the currency symbol" };
  if (text.endsWith("%")) return { kind: "not_a_number", hint: "give a plain number without %" };
  if (/^[+-]?[\d.,\s']+$/.test(text) && /\d/.test(text)) {
    return { kind: "not_a_number", hint: "write numbers without thousands separators and with a point as the decimal mark, e.g. 1234.5" };
  }
  return { kind: "not_a_number", hint: "expected a number such as 1250 or 1250.75" };
}
