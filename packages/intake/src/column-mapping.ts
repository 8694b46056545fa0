import {
  columnMappingSchema,
  sanitiseChannelName,
  type ColumnMapping,
  type ColumnMappingDraft,
  type ValidationReport,
} from "@tributary/contracts";
import { IssueList } from "./issue-list";
import { readNumber } from "./numeric-value";
import { listWords } from "./message-text";

export interface MappingNote {
  /** The role the note is about; "ignored" notes tell of a column left out. */
  readonly role: "week" | "brand" | "market" | "outcome" | "channels" | "ignored";
  readonly message: string;
}

export interface ColumnMappingGuess extends ColumnMappingDraft {
  /** Plain-English notes on what could not be decided (e.g. which column is the outcome). */
  readonly notes: readonly MappingNote[];
}

export type MappingResult = { readonly ok: true; readonly mapping: ColumnMapping } | { readonly ok: false; readonly report: ValidationReport };

const WEEK_NAMES = ["week", "week_start", "week_starting", "week_commencing", "week_beginning", "week_of", "date", "week_date", "monday"];
const BRAND_NAMES = ["brand", "brand_name"];
const MARKET_NAMES = ["market", "market_name", "country", "region"];
// Preferred outcome names, used only when several numeric columns could be the outcome.
const OUTCOME_NAMES = ["outcome", "new_customers", "customers", "acquisitions", "conversions", "signups", "orders", "sales"];
const CONTROL_PREFIX = /^(?:control|ctrl)_(.+)$/;
const CHANNEL_PATTERNS = [/^spend_(.+)$/, /^(.+)_spend$/, /^(.+)_cost$/];
const SAMPLE_ROWS = 200;

/** A header name in one spelling: lower case, spaces and dashes as underscores. */
function simplify(name: string): string {
  return name.trim().toLowerCase().replace(/[\s\-]+/g, "_");
}

function firstByNames(candidates: readonly string[], names: readonly string[]): string | null {
  for (const wanted of names) {
    const found = candidates.find((column) => simplify(column) === wanted);
    if (found !== undefined) return found;
  }
  return null;
}

/** True when every non-empty sampled value of the column reads as a number (and one is present). */
function looksNumeric(index: number, rows: readonly (readonly string[])[]): boolean {
  let seen = 0;
  for (let r = 0; r < rows.length && r < SAMPLE_ROWS; r++) {
    const value = rows[r]?.[index] ?? "";
    if (value.trim() === "") continue;
    const reading = readNumber(value);
    if (reading.kind !== "number" && reading.kind !== "too_large") return false;
    seen++;
  }
  return seen > 0;
}

/**
 * A first guess at the column roles from the header (and, when given, a sample of rows
 * to tell numeric columns apart). Matching is case-insensitive: `week`/`date`/`week_start`
 * → week; `spend_x`, `x_spend`, `x_cost` → channel x; `control_x` → control; the one
 * numeric column left → outcome (when several are left, a column named like an outcome
 * is taken, else the outcome stays unset and a note asks). Everything else is ignored.
 */
export function guessColumnMapping(header: readonly string[], rows?: readonly (readonly string[])[]): ColumnMappingGuess {
  const notes: MappingNote[] = [];
  const unused = new Set(header);
  const setAside = new Set<string>();
  const take = (column: string | null): string | null => {
    if (column !== null) unused.delete(column);
    return column;
  };
  const week = take(firstByNames(header, WEEK_NAMES));
  const brand = take(firstByNames(header, BRAND_NAMES));
  const market = take(firstByNames(header, MARKET_NAMES));

  const channels: { column: string; channel: string }[] = [];
  const controls: string[] = [];
  for (const column of header) {
    if (!unused.has(column)) continue;
    const simple = simplify(column);
    const control = CONTROL_PREFIX.exec(simple);
    if (control) {
      controls.push(column);
      unused.delete(column);
      continue;
    }
    for (const pattern of CHANNEL_PATTERNS) {
      const match = pattern.exec(simple);
      if (!match) continue;
      const channel = sanitiseChannelName(match[1] ?? "");
      if (channel === "") break;
      const clash = channels.find((c) => c.channel === channel);
      if (clash) {
        notes.push({ role: "ignored", message: `Columns "${clash.column}" and "${column}" both look like spend on ${channel}; "${column}" is ignored.` });
        setAside.add(column);
      } else {
        channels.push({ column, channel });
      }
      unused.delete(column);
      break;
    }
  }

  const leftover = header.filter((column) => unused.has(column));
  const numeric = rows === undefined ? leftover : leftover.filter((column) => looksNumeric(header.indexOf(column), rows));
  let outcome: string | null = null;
  if (numeric.length === 1) outcome = numeric[0] ?? null;
  else if (numeric.length > 1) {
    outcome = firstByNames(numeric, OUTCOME_NAMES);
    if (outcome === null) {
      notes.push({ role: "outcome", message: `Several columns could be the outcome (${listWords(numeric.map((c) => `"${c}"`))}); choose one, or name it "outcome".` });
    }
  } else {
    notes.push({ role: "outcome", message: "No numeric column is left for the outcome; choose the outcome column." });
  }
  take(outcome);

  if (week === null) notes.push({ role: "week", message: 'No column looks like the week; choose one, or name it "week".' });
  if (brand === null) notes.push({ role: "brand", message: 'No column looks like the brand; choose one, or name it "brand".' });
  if (market === null) notes.push({ role: "market", message: 'No column looks like the market; choose one, or name it "market".' });
  if (channels.length === 0) {
    notes.push({ role: "channels", message: 'No column looks like spend; map at least one spend column to a channel, or name the columns "spend_<channel>".' });
  }

  return { week, brand, market, outcome, channels, controls, ignored: header.filter((column) => unused.has(column) || setAside.has(column)), notes };
}

/**
 * Checks a mapping against a header: the shape, every named column exists and is used
 * once, the week, brand, market and outcome are set, at least one channel, channel names
 * sanitised to [a-z0-9_] and distinct. Header columns the mapping does not mention are
 * added to `ignored`. Never throws.
 */
export function validateMapping(input: unknown, header: readonly string[]): MappingResult {
  const issues = new IssueList();
  const parsed = columnMappingSchema.safeParse(input);
  if (!parsed.success) {
    for (const issue of parsed.error.issues) {
      const path = issue.path.map(String).join(".");
      const isRole = ["week", "brand", "market", "outcome"].includes(path);
      issues.error(
        isRole ? "mapping_incomplete" : "mapping_invalid",
        null,
        null,
        isRole ? `Choose the ${path} column.` : `Column mapping${path ? ` (${path})` : ""}: ${issue.message}`,
      );
    }
    return { ok: false, report: issues.report(null) };
  }
  const mapping = parsed.data;
  const known = new Set(header);
  const usedAs = new Map<string, string>();
  const use = (column: string, role: string) => {
    if (!known.has(column)) {
      issues.error("column_unknown", null, column, `The ${role} column "${column}" is not in the file's header.`);
      return;
    }
    const earlier = usedAs.get(column);
    if (earlier !== undefined) {
      issues.error("column_reused", null, column, `The column "${column}" is mapped twice (as ${earlier} and as ${role}); use each column once.`);
      return;
    }
    usedAs.set(column, role);
  };
  use(mapping.week, "week");
  use(mapping.brand, "brand");
  use(mapping.market, "market");
  use(mapping.outcome, "outcome");

  const channels: { column: string; channel: string }[] = [];
  const channelColumn = new Map<string, string>();
  for (const { column, channel: raw } of mapping.channels) {
    use(column, "spend");
    const channel = sanitiseChannelName(raw);
    if (channel === "") {
      issues.error("channel_name_invalid", null, column, `The channel name "${raw}" has no letters or digits; name the channel with a-z, 0-9 and _.`);
      continue;
    }
    const other = channelColumn.get(channel);
    if (other !== undefined) {
      issues.error("channel_name_duplicate", null, column, `Columns "${other}" and "${column}" are both named channel "${channel}"; give each channel its own name.`);
      continue;
    }
    channelColumn.set(channel, column);
    channels.push({ column, channel });
  }
  for (const column of mapping.controls) use(column, "control");
  for (const column of mapping.ignored) {
    if (usedAs.has(column)) issues.error("column_reused", null, column, `The column "${column}" is both mapped as ${usedAs.get(column)} and ignored.`);
  }
  if (issues.hasErrors()) return { ok: false, report: issues.report(null) };
  return {
    ok: true,
    mapping: {
      week: mapping.week,
      brand: mapping.brand,
      market: mapping.market,
      outcome: mapping.outcome,
      channels,
      controls: [...mapping.controls],
      ignored: header.filter((column) => !usedAs.has(column)),
    },
  };
}
