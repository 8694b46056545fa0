/** Longest brand or market name accepted. */
export const MAX_NAME_LENGTH = 100;

/** Invisible characters with no place in a name (zero-width space, word joiners, byte-order mark, soft hyphen). */
const INVISIBLE = /[\u00AD\u200B\u2060-\u2064\uFEFF]/g;
/** Joiners and direction marks: needed in some scripts, so kept for display, but ignored when names are compared. */
const IGNORED_IN_KEY = /[\u200C-\u200F]/g;
/** Direction embeddings, overrides and isolates: they can make a name read backwards. */
const DIRECTION_CONTROLS = /[\u202A-\u202E\u2066-\u2069]/;

/** A brand or market name as shown: Unicode-composed, invisible characters dropped, trimmed, inner spaces collapsed. */
export function displayName(raw: string): string {
  return raw.normalize("NFC").replace(INVISIBLE, "").trim().replace(/\s+/g, " ");
}

/**
 * The key under which names are the same: differing case, spacing and invisible
 * characters do not matter, so a name cannot make a twin that looks like another.
 */
export function nameKey(raw: string): string {
  return displayName(raw).replace(IGNORED_IN_KEY, "").toLowerCase();
}

/** Why a (displayed) brand or market name cannot be used, or null when it is fine. */
export function nameProblem(name: string): string | null {
  if (Array.from(name).length > MAX_NAME_LENGTH) return `is longer than ${MAX_NAME_LENGTH} characters`;
  if (/[\u0000-\u001f\u007f-\u009f]/.test(name)) return "contains control characters";
  if (DIRECTION_CONTROLS.test(name)) return "contains text-direction control characters, which can make it read backwards";
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
