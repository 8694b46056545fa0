/** Longest brand or market name accepted. */
export const MAX_NAME_LENGTH = 100;

/** A brand or market name as shown: Unicode-composed, trimmed, inner spaces collapsed. */
export function displayName(raw: string): string {
  return raw.normalize("NFC").trim().replace(/\s+/g, " ");
}

/** The key under which names are the same: differing case and spacing do not matter. */
export function nameKey(raw: string): string {
  return displayName(raw).toLowerCase();
}

/** Why a (displayed) brand or market name cannot be used, or null when it is fine. */
export function nameProblem(name: string): string | null {
  if (Array.from(name).length > MAX_NAME_LENGTH) return `is longer than ${MAX_NAME_LENGTH} characters`;
  if (/[\u0000-\u001f\u007f-\u009f]/.test(name)) return "contains control characters";
  // Spreadsheets run cells starting with these as formulas (OWASP, "CSV Injection").
  if (/^[=+\-@]/.test(name)) return `starts with "${name[0]}", which spreadsheets read as a formula`;
  return null;
}

/** Sort order for names: case-insensitive, then by exact text, the same everywhere. */
export function compareNames(a: string, b: string): number {
  const ka = a.toLowerCase();
  const kb = b.toLowerCase();
  if (ka !== kb) return ka < kb ? -1 : 1;
  return a < b ? -1 : a > b ? 1 : 0;
}
