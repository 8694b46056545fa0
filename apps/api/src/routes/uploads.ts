// Data intake: upload a tidy CSV, map and validate its columns, save it as a dataset
// version. Analysts and admins only; an upload is visible only to its uploader.
import {
  dayNumberToIsoDate,
  saveUploadInput,
  validateUploadInput,
  type CellSeriesPreview,
  type DatasetVersionDetail,
  type UploadCreated,
  type UploadValidation,
  type ValidationReport,
} from "@tributary/contracts";
import { analyseTidyRows, guessColumnMapping, parseCsvText, type TidyAnalysis } from "@tributary/intake";
import { allowedMarkets } from "../access/market-scope";
import { defineRoute, markets, signedIn } from "../access/route-table";
import type { Queryable } from "../db/client";
import { datasetVersionDetail } from "../datasets/dataset-queries";
import { planEntities, type EntityPlan } from "../datasets/portfolio-entities";
import { saveDatasetVersion } from "../datasets/save-dataset-version";
import { auditLog } from "../db/schema";
import { NotFound } from "../http/errors";
import { csvUpload, uploadedText } from "../uploads/csv-upload";
import { invalidFromReport } from "../uploads/report-error";
import type { StoredUpload, UploadStore } from "../uploads/upload-store";
import type { Request } from "express";

const PREVIEW_ROWS = 20;
const intakeRoles = ["analyst", "admin"] as const;

function uploadOf(req: Request, store: UploadStore, userId: string): StoredUpload {
  const upload = store.get(String(req.params.uploadId ?? ""), userId);
  if (!upload) throw new NotFound("This upload is not here any more (uploads are kept for a while only); upload the file again");
  return upload;
}

function guessOf(header: readonly string[], rows: readonly (readonly string[])[]): UploadCreated["guess"] {
  const guess = guessColumnMapping(header, rows);
  return { ...guess, channels: [...guess.channels], controls: [...guess.controls], ignored: [...guess.ignored], notes: [...guess.notes] };
}

function analyse(upload: StoredUpload, mapping: unknown): TidyAnalysis {
  return analyseTidyRows(upload.header, upload.rows, mapping, { rowNumbers: upload.rowNumbers });
}

function previewSeries(analysis: TidyAnalysis): CellSeriesPreview[] {
  const value = (x: number) => (Number.isFinite(x) ? x : null);
  const channelCount = analysis.mapping?.channels.length ?? 0;
  return analysis.cells.map((cell) => ({
    brand: cell.brand,
    market: cell.market,
    weeks: cell.rows.map((row) => dayNumberToIsoDate(row.day)),
    outcome: cell.rows.map((row) => value(row.outcome)),
    spend: Array.from({ length: channelCount }, (_, c) => cell.rows.map((row) => value(row.spend[c] ?? Number.NaN))),
  }));
}

/** The analysis's report with the entity problems (names that would collapse) added as errors. */
function withEntityProblems(report: ValidationReport, plan: EntityPlan | null): ValidationReport {
  if (plan === null || plan.problems.length === 0) return report;
  const counts = [...report.counts];
  for (const problem of plan.problems) {
    const at = counts.findIndex((c) => c.severity === problem.severity && c.code === problem.code);
    const count = at >= 0 ? counts[at]! : { severity: problem.severity, code: problem.code, count: 0, shown: 0 };
    const next = { ...count, count: count.count + 1, shown: count.shown + 1 };
    if (at >= 0) counts[at] = next;
    else counts.push(next);
  }
  return { ...report, ok: false, errors: [...plan.problems, ...report.errors], errorCount: report.errorCount + plan.problems.length, counts };
}

async function planFor(db: Queryable, analysis: TidyAnalysis): Promise<EntityPlan | null> {
  if (analysis.mapping === null) return null;
  return planEntities(db, {
    cells: analysis.cells.map((cell) => ({ brand: cell.brand, market: cell.market })),
    channels: analysis.mapping.channels.map((c) => c.channel),
    brandColumn: analysis.mapping.brand,
    marketColumn: analysis.mapping.market,
  });
}

export const uploadRoutes = [
  defineRoute({
    method: "post",
    path: "/api/uploads",
    access: signedIn(markets.unscoped, intakeRoles),
    before: ({ config }) => [csvUpload(config.uploadMaxBytes)],
    handler: async ({ req, res, db, user, config, uploads }): Promise<UploadCreated> => {
      const file = uploadedText(req);
      const csv = parseCsvText(file.text, { maxBytes: config.uploadMaxBytes });
      if (!csv.ok) throw invalidFromReport(`"${file.fileName}" cannot be read as a CSV file`, csv.report);
      const upload = uploads.put(user.id, { fileName: file.fileName, bytes: file.bytes, header: csv.header, rows: csv.rows, rowNumbers: csv.rowNumbers });
      await db.insert(auditLog).values({
        userId: user.id,
        action: "data_uploaded",
        target: `upload:${upload.id}`,
        details: { fileName: file.fileName, bytes: file.bytes, rows: csv.rows.length, columns: csv.header.length },
      });
      res.status(201);
      return {
        uploadId: upload.id,
        fileName: upload.fileName,
        bytes: upload.bytes,
        expiresAt: new Date(upload.expiresAt).toISOString(),
        header: [...csv.header],
        rowCount: csv.rows.length,
        previewRows: csv.rows.slice(0, PREVIEW_ROWS).map((row) => [...row]),
        guess: guessOf(csv.header, csv.rows),
      };
    },
  }),
  defineRoute({
    method: "post",
    path: "/api/uploads/:uploadId/validate",
    access: signedIn(markets.unscoped, intakeRoles),
    handler: async ({ req, db, user, uploads }): Promise<UploadValidation> => {
      const upload = uploadOf(req, uploads, user.id);
      const input = validateUploadInput.parse(req.body ?? {});
      const analysis = analyse(upload, input.mapping);
      const plan = await planFor(db, analysis);
      const report = withEntityProblems(analysis.report, plan);
      return {
        uploadId: upload.id,
        mapping: analysis.mapping,
        report,
        channels: analysis.mapping?.channels.map((c) => c.channel) ?? [],
        series: previewSeries(analysis),
        newEntities: plan?.newEntities ?? { brands: [], markets: [], channels: [], cells: [] },
        canSave: report.ok,
      };
    },
  }),
  defineRoute({
    method: "post",
    path: "/api/uploads/:uploadId/save",
    access: signedIn(markets.unscoped, intakeRoles),
    handler: async ({ req, res, db, user, uploads }): Promise<DatasetVersionDetail> => {
      const upload = uploadOf(req, uploads, user.id);
      const input = saveUploadInput.parse(req.body ?? {});
      const analysis = analyse(upload, input.mapping);
      if (!analysis.report.ok) throw invalidFromReport("The data cannot be saved until its errors are fixed", analysis.report);
      const saved = await saveDatasetVersion(db, { fileName: upload.fileName, note: input.note || null, userId: user.id, analysis });
      uploads.delete(upload.id);
      res.status(201);
      // The scope is read again: the save may have created markets.
      return datasetVersionDetail(db, saved.id, await allowedMarkets(db, user));
    },
  }),
];
