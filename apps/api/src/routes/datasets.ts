// Dataset versions: the list, one version, a cell's weekly series and the example file.
// Every signed-in role may read them; market managers see only their markets' cells,
// and neither the validation report nor the totals (they span every market).
import { and, asc, eq } from "drizzle-orm";
import type { DatasetSeries, DatasetVersion, DatasetVersionDetail } from "@tributary/contracts";
import { defineRoute, markets, signedIn } from "../access/route-table";
import { datasetCells, datasetVersionDetail, datasetVersionExists, listDatasetVersions } from "../datasets/dataset-queries";
import { exampleCsv, exampleCsvFileName } from "../datasets/example-csv";
import { cells, datasetRows, datasetVersions } from "../db/schema";
import { Invalid, NotFound } from "../http/errors";

/** The market of the cell named by `?cell=`; null (404) when there is no such cell. */
const cellFromQuery = markets.resolvedBy(async (req, db) => {
  const cellId = typeof req.query.cell === "string" ? req.query.cell.trim() : "";
  if (cellId === "") throw new Invalid("Choose a cell: add ?cell=<cell id>");
  const [cell] = await db.select({ marketId: cells.marketId }).from(cells).where(eq(cells.id, cellId));
  return cell ? [cell.marketId] : null;
});

export const datasetRoutes = [
  defineRoute({
    method: "get",
    path: "/api/datasets",
    access: signedIn(markets.filtered),
    handler: ({ db, scope }): Promise<DatasetVersion[]> => listDatasetVersions(db, scope),
  }),
  // Declared before /api/datasets/:datasetId so "example.csv" is not read as an id.
  defineRoute({
    method: "get",
    path: "/api/datasets/example.csv",
    access: signedIn(markets.unscoped),
    handler: ({ res }) => {
      res.setHeader("Content-Type", "text/csv; charset=utf-8");
      res.setHeader("Content-Disposition", `attachment; filename="${exampleCsvFileName}"`);
      res.send(exampleCsv());
    },
  }),
  defineRoute({
    method: "get",
    path: "/api/datasets/:datasetId",
    access: signedIn(markets.filtered),
    handler: ({ req, db, scope }): Promise<DatasetVersionDetail> => datasetVersionDetail(db, String(req.params.datasetId), scope),
  }),
  defineRoute({
    method: "get",
    path: "/api/datasets/:datasetId/series",
    access: signedIn(cellFromQuery),
    handler: async ({ req, db, scope }): Promise<DatasetSeries> => {
      const versionId = String(req.params.datasetId);
      const cellId = String(req.query.cell);
      const version = await datasetVersionExists(db, versionId);
      if (!version) throw new NotFound("No such dataset version");
      const [cell] = (await datasetCells(db, versionId, scope)).filter((c) => c.cellId === cellId);
      if (!cell) throw new NotFound("This dataset version has no data for that cell");
      const [meta] = await db.select({ controls: datasetVersions.controlNames }).from(datasetVersions).where(eq(datasetVersions.id, versionId));
      const rows = await db
        .select({ week: datasetRows.week, outcome: datasetRows.outcome, spend: datasetRows.spend, controls: datasetRows.controls })
        .from(datasetRows)
        .where(and(eq(datasetRows.datasetVersionId, versionId), eq(datasetRows.cellId, cellId)))
        .orderBy(asc(datasetRows.week));
      const controls = meta?.controls ?? [];
      return {
        datasetVersionId: versionId,
        cell,
        channels: version.channels,
        controls,
        weeks: rows.map((r) => r.week),
        outcome: rows.map((r) => r.outcome),
        spend: version.channels.map((_, c) => rows.map((r) => r.spend[c] ?? 0)),
        controlValues: controls.map((_, k) => rows.map((r) => r.controls[k] ?? 0)),
      };
    },
  }),
];
