import { z } from "zod";
import {
  columnMappingDraftSchema,
  columnMappingSchema,
  datasetSummarySchema,
  liftTestInputSchema,
  validationReportSchema,
} from "./intake";

// Uploads, dataset versions and lift tests as the API sends them.

const userRefSchema = z.object({ id: z.string(), name: z.string() });

/** A note on what the column guess could not decide. */
export const mappingNoteSchema = z.object({
  role: z.enum(["week", "brand", "market", "outcome", "channels", "ignored"]),
  message: z.string(),
});

/** POST /api/uploads (multipart, field "file"): the file is read and kept for a while under `uploadId`. */
export const uploadCreatedSchema = z.object({
  uploadId: z.string(),
  fileName: z.string(),
  bytes: z.number().int(),
  /** When the server forgets the upload (ISO time); validate and save before then. */
  expiresAt: z.string(),
  header: z.array(z.string()),
  rowCount: z.number().int(),
  /** The first rows as text, for a preview table. */
  previewRows: z.array(z.array(z.string())),
  /** A first guess at the column roles, with notes on what it could not decide. */
  guess: columnMappingDraftSchema.extend({ notes: z.array(mappingNoteSchema) }),
});
export type UploadCreated = z.infer<typeof uploadCreatedSchema>;

/** POST /api/uploads/:uploadId/validate */
export const validateUploadInput = z.object({ mapping: z.unknown() });
export type ValidateUploadInput = z.infer<typeof validateUploadInput>;

/** POST /api/uploads/:uploadId/save */
export const saveUploadInput = z.object({
  mapping: columnMappingSchema,
  note: z.string().trim().max(500, "Keep the note under 500 characters").optional(),
});
export type SaveUploadInput = z.infer<typeof saveUploadInput>;

/** Weekly series of one cell: the preview chart of the Data intake screen. */
export const cellSeriesPreviewSchema = z.object({
  brand: z.string(),
  market: z.string(),
  /** Mondays, consecutive unless the report names gaps. */
  weeks: z.array(z.string()),
  /** Null where the value was not a valid number. */
  outcome: z.array(z.number().nullable()),
  /** One array per channel (in `channels` order), aligned with `weeks`. */
  spend: z.array(z.array(z.number().nullable())),
});
export type CellSeriesPreview = z.infer<typeof cellSeriesPreviewSchema>;

/** Brands, markets, channels and cells that saving would create (not yet in the workspace). */
export const newEntitiesSchema = z.object({
  brands: z.array(z.string()),
  markets: z.array(z.string()),
  channels: z.array(z.string()),
  cells: z.array(z.object({ brand: z.string(), market: z.string() })),
});
export type NewEntities = z.infer<typeof newEntitiesSchema>;

export const uploadValidationSchema = z.object({
  uploadId: z.string(),
  /** The mapping as it will be saved (channel names cleaned), or null when it is not valid. */
  mapping: columnMappingSchema.nullable(),
  report: validationReportSchema,
  channels: z.array(z.string()),
  series: z.array(cellSeriesPreviewSchema),
  newEntities: newEntitiesSchema,
  /** True when saving is allowed (no errors). */
  canSave: z.boolean(),
});
export type UploadValidation = z.infer<typeof uploadValidationSchema>;

/** A saved, immutable dataset version. For market managers, `summary` holds only their cells and `report` is null. */
export const datasetVersionSchema = z.object({
  id: z.string(),
  number: z.number().int(),
  fileName: z.string(),
  note: z.string().nullable(),
  outcomeColumn: z.string(),
  channels: z.array(z.string()),
  controls: z.array(z.string()),
  createdAt: z.string(),
  createdBy: userRefSchema.nullable(),
  rows: z.number().int(),
  cellCount: z.number().int(),
  firstWeek: z.string().nullable(),
  lastWeek: z.string().nullable(),
  errorCount: z.number().int(),
  warningCount: z.number().int(),
  /** True for the newest version (the one the portfolio screens use). */
  latest: z.boolean(),
});
export type DatasetVersion = z.infer<typeof datasetVersionSchema>;

export const datasetCellSchema = z.object({
  cellId: z.string(),
  brandId: z.string(),
  marketId: z.string(),
  brand: z.string(),
  market: z.string(),
  firstWeek: z.string(),
  lastWeek: z.string(),
  weeks: z.number().int(),
});
export type DatasetCell = z.infer<typeof datasetCellSchema>;

/** GET /api/datasets/:datasetId */
export const datasetVersionDetailSchema = datasetVersionSchema.extend({
  mapping: columnMappingSchema,
  cells: z.array(datasetCellSchema),
  /** The validation report at save time (warnings only, since errors block saving); null for market managers. */
  report: validationReportSchema.nullable(),
  /** Totals and cell list; null for market managers (it spans every market). */
  summary: datasetSummarySchema.nullable(),
});
export type DatasetVersionDetail = z.infer<typeof datasetVersionDetailSchema>;

/** GET /api/datasets/:datasetId/series?cell=<cellId> */
export const datasetSeriesSchema = z.object({
  datasetVersionId: z.string(),
  cell: datasetCellSchema,
  channels: z.array(z.string()),
  controls: z.array(z.string()),
  weeks: z.array(z.string()),
  outcome: z.array(z.number()),
  /** One array per channel, aligned with `weeks`. */
  spend: z.array(z.array(z.number())),
  controlValues: z.array(z.array(z.number())),
});
export type DatasetSeries = z.infer<typeof datasetSeriesSchema>;

// ---------------------------------------------------------------------------------
// Lift tests
// ---------------------------------------------------------------------------------

/** POST /api/datasets/:datasetId/lift-tests as JSON: one test, or several at once (all or none are stored). */
export const liftTestsCreateInput = z.union([
  z.object({ tests: z.array(z.unknown()).min(1, "Send at least one lift test").max(1000) }),
  z.record(z.string(), z.unknown()),
]);

export const liftTestRecordSchema = liftTestInputSchema.safeExtend({
  id: z.string(),
  datasetVersionId: z.string(),
  cellId: z.string(),
  marketId: z.string(),
  createdAt: z.string(),
  createdBy: userRefSchema.nullable(),
});
export type LiftTestRecord = z.infer<typeof liftTestRecordSchema>;

export const liftTestsCreatedSchema = z.object({
  created: z.array(liftTestRecordSchema),
  /** Warnings (e.g. no spend on the channel in the test weeks) that did not block saving. */
  report: validationReportSchema,
});
export type LiftTestsCreated = z.infer<typeof liftTestsCreatedSchema>;
