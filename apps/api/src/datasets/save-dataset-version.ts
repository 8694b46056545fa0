// Saves a validated upload as a new, immutable dataset version: brands, markets,
// channels and cells it names are created on the fly, all in one transaction, so a
// failure anywhere saves nothing.
import { max } from "drizzle-orm";
import { dayNumberToIsoDate, type ColumnMapping } from "@tributary/contracts";
import type { TidyAnalysis } from "@tributary/intake";
import type { Database, Queryable } from "../db/client";
import { auditLog, datasetRows, datasetVersions } from "../db/schema";
import { Invalid } from "../http/errors";
import { invalidFromReport } from "../uploads/report-error";
import { createPlannedEntities, planEntities } from "./portfolio-entities";

const ROW_BATCH = 500;

export interface SaveDatasetInput {
  readonly fileName: string;
  readonly note: string | null;
  readonly userId: string;
  /** An analysis without errors (its mapping is the cleaned one). */
  readonly analysis: TidyAnalysis;
}

export interface SaveHooks {
  /** Runs inside the transaction after the entities exist, before the version is written (tests inject failures here). */
  readonly afterEntities?: (tx: Queryable) => Promise<void> | void;
}

export async function saveDatasetVersion(db: Database, input: SaveDatasetInput, hooks: SaveHooks = {}): Promise<{ id: string; number: number }> {
  const { analysis } = input;
  if (!analysis.report.ok || analysis.mapping === null) throw invalidFromReport("The data cannot be saved", analysis.report);
  const mapping: ColumnMapping = analysis.mapping;
  const channelCodes = mapping.channels.map((c) => c.channel);
  const dataCells = analysis.cells.map((cell) => ({ brand: cell.brand, market: cell.market }));

  return db.transaction(async (tx) => {
    // Planned inside the transaction, so entities created meanwhile by someone else are reused.
    const plan = await planEntities(tx, { cells: dataCells, channels: channelCodes, brandColumn: mapping.brand, marketColumn: mapping.market });
    if (plan.problems.length > 0) {
      throw new Invalid(
        `The data cannot be saved: ${plan.problems[0]!.message}`,
        plan.problems.map((p) => ({ path: p.column ?? "file", message: p.message })),
      );
    }
    const entities = await createPlannedEntities(tx, plan, dataCells, channelCodes);
    await hooks.afterEntities?.(tx);

    const [top] = await tx.select({ number: max(datasetVersions.number) }).from(datasetVersions);
    const number = (top?.number ?? 0) + 1;
    const [version] = await tx
      .insert(datasetVersions)
      .values({
        number,
        fileName: input.fileName,
        note: input.note,
        outcomeColumn: mapping.outcome,
        channelCodes,
        controlNames: [...mapping.controls],
        columnMapping: mapping,
        validationReport: analysis.report,
        createdBy: input.userId,
      })
      .returning({ id: datasetVersions.id });
    const versionId = version!.id;

    const rows = analysis.cells.flatMap((cell) => {
      const cellId = entities.cellId(cell.brand, cell.market);
      return cell.rows.map((row) => ({
        datasetVersionId: versionId,
        cellId,
        week: dayNumberToIsoDate(row.day),
        outcome: row.outcome,
        spend: Array.from(row.spend),
        controls: Array.from(row.controls),
      }));
    });
    for (let start = 0; start < rows.length; start += ROW_BATCH) await tx.insert(datasetRows).values(rows.slice(start, start + ROW_BATCH));

    await tx.insert(auditLog).values({
      userId: input.userId,
      action: "dataset_saved",
      target: `dataset_version:${versionId}`,
      details: {
        number,
        fileName: input.fileName,
        rows: rows.length,
        cells: dataCells.length,
        warnings: analysis.report.warningCount,
        created: plan.newEntities,
      },
    });
    return { id: versionId, number };
  });
}
