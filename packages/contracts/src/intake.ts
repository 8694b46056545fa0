import { z } from "zod";

// Shapes of the data intake: the column mapping of an uploaded tidy CSV, the validation
// report the intake package returns, and a lift test as entered or uploaded.

// ---------------------------------------------------------------------------------
// Week dates
// ---------------------------------------------------------------------------------

const MS_PER_DAY = 86_400_000;
/** Day number (days since 1970-01-01) of 1970-01-05, a Monday: week numbers count from it. */
export const EPOCH_MONDAY_DAY = 4;
const MIN_YEAR = 1900;
const MAX_YEAR = 2100;

/**
 * The day number (days since 1970-01-01, UTC) of an ISO date `YYYY-MM-DD`, or null when
 * the text is not a real calendar date between 1900 and 2100.
 */
export function isoDateToDayNumber(text: string): number | null {
  const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(text);
  if (!match) return null;
  const year = Number(match[1]);
  const month = Number(match[2]);
  const day = Number(match[3]);
  if (year < MIN_YEAR || year > MAX_YEAR || month < 1 || month > 12 || day < 1) return null;
  const ms = Date.UTC(year, month - 1, day);
  const back = new Date(ms);
  // Date.UTC rolls 2023-02-30 over to March; a real date survives the round trip.
  if (back.getUTCFullYear() !== year || back.getUTCMonth() !== month - 1 || back.getUTCDate() !== day) return null;
  return ms / MS_PER_DAY;
}

/** The ISO date `YYYY-MM-DD` of a day number (days since 1970-01-01, UTC). */
export function dayNumberToIsoDate(dayNumber: number): string {
  return new Date(dayNumber * MS_PER_DAY).toISOString().slice(0, 10);
}

/** Day of the week of a day number: 0 = Monday … 6 = Sunday. */
export function weekdayOfDayNumber(dayNumber: number): number {
  return (((dayNumber - EPOCH_MONDAY_DAY) % 7) + 7) % 7;
}

export const weekdayNames = ["Monday", "Tuesday", "Wednesday", "Thursday", "Friday", "Saturday", "Sunday"] as const;

/** An ISO date that is a Monday: how weeks are named everywhere in the product. */
export const weekDateSchema = z
  .string()
  .trim()
  .refine((text) => isoDateToDayNumber(text) !== null, "Enter a date as YYYY-MM-DD, e.g. 2024-01-01")
  .refine((text) => {
    const day = isoDateToDayNumber(text);
    return day === null || weekdayOfDayNumber(day) === 0;
  }, "Weeks are named by their Monday; this date is not a Monday");

// ---------------------------------------------------------------------------------
// Column mapping
// ---------------------------------------------------------------------------------

/** Channel names are lower-case letters, digits and underscores. */
export const channelNamePattern = /^[a-z0-9_]+$/;
export const MAX_CHANNEL_NAME_LENGTH = 64;

/**
 * A channel name made safe: accents dropped, lower case, every run of other characters
 * turned into one underscore, underscores trimmed ("Paid Social!" → "paid_social").
 * Returns "" when nothing usable is left.
 */
export function sanitiseChannelName(raw: string): string {
  return raw
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, "_")
    .replace(/^_+|_+$/g, "")
    .slice(0, MAX_CHANNEL_NAME_LENGTH)
    .replace(/_+$/g, "");
}

const columnName = z.string().min(1, "Choose a column");

export const channelColumnSchema = z.object({
  /** The CSV column holding this channel's weekly spend. */
  column: columnName,
  /** The channel's name in the product; sanitised to [a-z0-9_] by validation. */
  channel: z.string().trim().min(1, "Give the channel a name").max(MAX_CHANNEL_NAME_LENGTH),
});

/** Which CSV column plays which role. Header columns it does not mention are ignored. */
export const columnMappingSchema = z.object({
  week: columnName,
  brand: columnName,
  market: columnName,
  outcome: columnName,
  channels: z.array(channelColumnSchema).min(1, "Map at least one spend column to a channel").max(50),
  controls: z.array(columnName).max(50),
  ignored: z.array(z.string()),
});
export type ChannelColumn = z.infer<typeof channelColumnSchema>;
export type ColumnMapping = z.infer<typeof columnMappingSchema>;

/** A mapping being filled in: the single-column roles may still be unset. */
export const columnMappingDraftSchema = columnMappingSchema.extend({
  week: columnName.nullable(),
  brand: columnName.nullable(),
  market: columnName.nullable(),
  outcome: columnName.nullable(),
  channels: z.array(channelColumnSchema),
});
export type ColumnMappingDraft = z.infer<typeof columnMappingDraftSchema>;

// ---------------------------------------------------------------------------------
// Validation report
// ---------------------------------------------------------------------------------

export const intakeIssueCodes = [
  // the file
  "file_empty",
  "file_too_large",
  "not_csv",
  "not_utf8",
  "control_characters",
  "wrong_delimiter",
  "malformed_quotes",
  "column_count",
  "header_invalid",
  "too_many_columns",
  "no_data_rows",
  // the mapping
  "mapping_invalid",
  "mapping_incomplete",
  "column_unknown",
  "column_reused",
  "channel_name_invalid",
  "channel_name_duplicate",
  "column_ignored",
  // values
  "value_missing",
  "not_a_number",
  "formula",
  "not_finite",
  "number_too_large",
  "negative_spend",
  "negative_outcome",
  "date_invalid",
  "date_not_monday",
  "name_invalid",
  "name_variants",
  // cells
  "duplicate_row",
  "week_gap",
  "cell_too_short",
  "cell_short",
  "partial_week",
  "spike",
  "channel_no_spend",
  "outcome_all_zero",
  // lift tests
  "cell_unknown",
  "channel_unknown",
  "window_order",
  "window_outside_data",
  "standard_error_invalid",
  "lift_no_spend_in_data",
] as const;
export const intakeIssueCodeSchema = z.enum(intakeIssueCodes);
export type IntakeIssueCode = z.infer<typeof intakeIssueCodeSchema>;

/** One problem found in an upload. Errors block saving; warnings do not. */
export const intakeIssueSchema = z.object({
  severity: z.enum(["error", "warning"]),
  code: intakeIssueCodeSchema,
  /** Spreadsheet row number (the header is row 1), or null for the file, a cell or a field. */
  row: z.number().int().nullable(),
  /** The column (or input field) concerned, or null. */
  column: z.string().nullable(),
  message: z.string(),
});
export type IntakeIssue = z.infer<typeof intakeIssueSchema>;

/** How many issues of one kind were found and how many of them are listed. */
export const issueCountSchema = z.object({
  severity: z.enum(["error", "warning"]),
  code: intakeIssueCodeSchema,
  count: z.number().int(),
  shown: z.number().int(),
});
export type IssueCount = z.infer<typeof issueCountSchema>;

export const cellSummarySchema = z.object({
  brand: z.string(),
  market: z.string(),
  firstWeek: z.string(),
  lastWeek: z.string(),
  /** Distinct weeks with a row. */
  weeks: z.number().int(),
  rows: z.number().int(),
});
export type CellSummary = z.infer<typeof cellSummarySchema>;

export const datasetSummarySchema = z.object({
  rows: z.number().int(),
  cells: z.array(cellSummarySchema),
  brands: z.array(z.string()),
  markets: z.array(z.string()),
  channels: z.array(z.string()),
  controls: z.array(z.string()),
  firstWeek: z.string().nullable(),
  lastWeek: z.string().nullable(),
  totals: z.object({
    /** Sum of the outcome over rows whose outcome is a valid number. */
    outcome: z.number(),
    spend: z.array(z.object({ channel: z.string(), total: z.number() })),
  }),
});
export type DatasetSummary = z.infer<typeof datasetSummarySchema>;

export const validationReportSchema = z.object({
  /** True when there are no errors (warnings allowed). */
  ok: z.boolean(),
  errors: z.array(intakeIssueSchema),
  warnings: z.array(intakeIssueSchema),
  /** Totals including the issues left out of the capped lists. */
  errorCount: z.number().int(),
  warningCount: z.number().int(),
  counts: z.array(issueCountSchema),
  /** What the rows hold, or null when the file could not be read. */
  summary: datasetSummarySchema.nullable(),
});
export type ValidationReport = z.infer<typeof validationReportSchema>;

// ---------------------------------------------------------------------------------
// Lift tests
// ---------------------------------------------------------------------------------

/** A controlled experiment on one channel in one cell, as entered or uploaded. */
export const liftTestInputSchema = z
  .object({
    brand: z.string().trim().min(1, "Enter the brand").max(100),
    market: z.string().trim().min(1, "Enter the market").max(100),
    channel: z.string().trim().min(1, "Enter the channel").max(MAX_CHANNEL_NAME_LENGTH),
    firstWeek: weekDateSchema,
    lastWeek: weekDateSchema,
    /** Spend on the channel during the test, in the reporting currency. */
    spend: z.number("Enter the spend as a number").nonnegative("Spend cannot be negative").max(1e12),
    /** Measured incremental outcome (e.g. extra new customers); may be negative. */
    incrementalOutcome: z.number("Enter the incremental outcome as a number").min(-1e12).max(1e12),
    standardError: z
      .number("Enter the standard error as a number")
      .positive("The standard error must be greater than 0")
      .max(1e12),
    note: z.string().trim().max(500).optional(),
  })
  .refine(
    (test) => {
      const first = isoDateToDayNumber(test.firstWeek);
      const last = isoDateToDayNumber(test.lastWeek);
      return first === null || last === null || first <= last;
    },
    { message: "The first week must not be after the last week", path: ["lastWeek"] },
  );
export type LiftTestInput = z.infer<typeof liftTestInputSchema>;
