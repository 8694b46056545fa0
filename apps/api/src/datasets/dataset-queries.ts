// Reads of dataset versions: the list, one version with its cells, a cell's weekly
// series, and the whole version as the model's PortfolioData.
import { and, asc, count, desc, eq, max, min, sql } from "drizzle-orm";
import { isoDateToDayNumber, type ColumnMapping, type DatasetCell, type DatasetVersion, type DatasetVersionDetail, type ValidationReport } from "@tributary/contracts";
import type { CellSeries, PortfolioData } from "@tributary/stats";
import { inScope } from "../access/market-scope";
import type { MarketScope } from "../access/route-table";
import type { Queryable } from "../db/client";
import { brands, cells, datasetRows, datasetVersions, markets, users } from "../db/schema";
import { NotFound } from "../http/errors";

const versionColumns = {
  id: datasetVersions.id,
  number: datasetVersions.number,
  fileName: datasetVersions.fileName,
  note: datasetVersions.note,
  outcomeColumn: datasetVersions.outcomeColumn,
  channels: datasetVersions.channelCodes,
  controls: datasetVersions.controlNames,
  createdAt: datasetVersions.createdAt,
  createdById: datasetVersions.createdBy,
  createdByName: users.name,
  report: datasetVersions.validationReport,
};

type VersionRow = {
  id: string;
  number: number;
  fileName: string;
  note: string | null;
  outcomeColumn: string;
  channels: string[];
  controls: string[];
  createdAt: Date;
  createdById: string | null;
  createdByName: string | null;
  report: unknown;
};

async function latestNumber(db: Queryable): Promise<number | null> {
  const [row] = await db.select({ number: max(datasetVersions.number) }).from(datasetVersions);
  return row?.number ?? null;
}

/** Rows, cells and weeks of each version, counted over the cells in scope only. */
async function scopedCounts(db: Queryable, scope: MarketScope, versionId?: string) {
  const rows = await db
    .select({
      versionId: datasetRows.datasetVersionId,
      rows: count(),
      cells: sql<number>`count(distinct ${datasetRows.cellId})::int`,
      firstWeek: min(datasetRows.week),
      lastWeek: max(datasetRows.week),
    })
    .from(datasetRows)
    .innerJoin(cells, eq(cells.id, datasetRows.cellId))
    .where(and(inScope(cells.marketId, scope), versionId ? eq(datasetRows.datasetVersionId, versionId) : undefined))
    .groupBy(datasetRows.datasetVersionId);
  return new Map(rows.map((row) => [row.versionId, row] as const));
}

function versionOf(row: VersionRow, counts: Map<string, { rows: number; cells: number; firstWeek: string | null; lastWeek: string | null }>, latest: number | null): DatasetVersion {
  const c = counts.get(row.id);
  const report = row.report as Partial<ValidationReport>;
  return {
    id: row.id,
    number: row.number,
    fileName: row.fileName,
    note: row.note,
    outcomeColumn: row.outcomeColumn,
    channels: row.channels,
    controls: row.controls,
    createdAt: row.createdAt.toISOString(),
    createdBy: row.createdById && row.createdByName ? { id: row.createdById, name: row.createdByName } : null,
    rows: c?.rows ?? 0,
    cellCount: c?.cells ?? 0,
    firstWeek: c?.firstWeek ?? null,
    lastWeek: c?.lastWeek ?? null,
    errorCount: report.errorCount ?? 0,
    warningCount: report.warningCount ?? 0,
    latest: row.number === latest,
  };
}

/** Every dataset version, newest first; counts cover the cells in scope. */
export async function listDatasetVersions(db: Queryable, scope: MarketScope): Promise<DatasetVersion[]> {
  const [rows, counts, latest] = await Promise.all([
    db.select(versionColumns).from(datasetVersions).leftJoin(users, eq(users.id, datasetVersions.createdBy)).orderBy(desc(datasetVersions.number)),
    scopedCounts(db, scope),
    latestNumber(db),
  ]);
  return rows.map((row) => versionOf(row, counts, latest));
}

/** The cells of a version in scope, with their weeks. */
export async function datasetCells(db: Queryable, versionId: string, scope: MarketScope): Promise<DatasetCell[]> {
  return db
    .select({
      cellId: cells.id,
      brandId: cells.brandId,
      marketId: cells.marketId,
      brand: brands.name,
      market: markets.name,
      firstWeek: sql<string>`min(${datasetRows.week})::text`,
      lastWeek: sql<string>`max(${datasetRows.week})::text`,
      weeks: sql<number>`count(*)::int`,
    })
    .from(datasetRows)
    .innerJoin(cells, eq(cells.id, datasetRows.cellId))
    .innerJoin(brands, eq(brands.id, cells.brandId))
    .innerJoin(markets, eq(markets.id, cells.marketId))
    .where(and(eq(datasetRows.datasetVersionId, versionId), inScope(cells.marketId, scope)))
    .groupBy(cells.id, brands.name, markets.name)
    .orderBy(asc(brands.name), asc(markets.name));
}

/**
 * One version with its mapping and cells. The report and the summary span every market,
 * so they are left out for users who do not see every market.
 */
export async function datasetVersionDetail(db: Queryable, versionId: string, scope: MarketScope): Promise<DatasetVersionDetail> {
  const [row] = await db
    .select({ ...versionColumns, mapping: datasetVersions.columnMapping })
    .from(datasetVersions)
    .leftJoin(users, eq(users.id, datasetVersions.createdBy))
    .where(eq(datasetVersions.id, versionId));
  if (!row) throw new NotFound("No such dataset version");
  const [counts, latest, cellList] = await Promise.all([scopedCounts(db, scope, versionId), latestNumber(db), datasetCells(db, versionId, scope)]);
  const report = row.report as ValidationReport;
  return {
    ...versionOf(row, counts, latest),
    mapping: row.mapping as ColumnMapping,
    cells: cellList,
    report: scope.allMarkets ? report : null,
    summary: scope.allMarkets ? (report.summary ?? null) : null,
  };
}

export async function datasetVersionExists(db: Queryable, versionId: string): Promise<{ id: string; number: number; channels: string[] } | null> {
  const [row] = await db
    .select({ id: datasetVersions.id, number: datasetVersions.number, channels: datasetVersions.channelCodes })
    .from(datasetVersions)
    .where(eq(datasetVersions.id, versionId));
  return row ?? null;
}

/** A cell of the model's data with the workspace ids behind it. */
export interface PortfolioCellRef {
  readonly cellId: string;
  readonly brandId: string;
  readonly marketId: string;
  readonly brandCode: string;
  readonly marketCode: string;
}

export interface StoredPortfolio {
  readonly versionId: string;
  readonly versionNumber: number;
  readonly data: PortfolioData;
  /** Aligned with data.cells. */
  readonly cells: readonly PortfolioCellRef[];
}

/**
 * A dataset version as the model's data: cells sorted by brand then market name, named
 * by the workspace's brand and market names, weeks consecutive (as saved).
 */
export async function loadPortfolioData(db: Queryable, versionId: string): Promise<StoredPortfolio> {
  const [version] = await db.select().from(datasetVersions).where(eq(datasetVersions.id, versionId));
  if (!version) throw new NotFound("No such dataset version");
  const cellRows = await db
    .selectDistinct({
      cellId: cells.id,
      brandId: cells.brandId,
      marketId: cells.marketId,
      brand: brands.name,
      market: markets.name,
      brandCode: brands.code,
      marketCode: markets.code,
    })
    .from(datasetRows)
    .innerJoin(cells, eq(cells.id, datasetRows.cellId))
    .innerJoin(brands, eq(brands.id, cells.brandId))
    .innerJoin(markets, eq(markets.id, cells.marketId))
    .where(eq(datasetRows.datasetVersionId, versionId))
    .orderBy(asc(brands.name), asc(markets.name), asc(cells.id));
  // The weekly rows in one plain query: the driver parses the number arrays far faster than the query builder's mapping.
  const weekly = await db.execute<{ cell_id: string; week: string; outcome: number; spend: number[]; controls: number[] }>(
    sql`select cell_id, week::text as week, outcome, spend, controls from dataset_rows where dataset_version_id = ${versionId} order by cell_id, week`,
  );
  const byCell = new Map<string, (typeof weekly.rows)[number][]>();
  for (const row of weekly.rows) {
    const list = byCell.get(row.cell_id);
    if (list) list.push(row);
    else byCell.set(row.cell_id, [row]);
  }
  const rows = cellRows.flatMap((cell) =>
    (byCell.get(cell.cellId) ?? []).map((row) => ({ ...cell, week: row.week, outcome: row.outcome, spend: row.spend, controls: row.controls })),
  );

  const C = version.channelCodes.length;
  const K = version.controlNames.length;
  const groups: (typeof rows)[] = [];
  for (const row of rows) {
    const last = groups[groups.length - 1];
    if (last && last[0]!.cellId === row.cellId) last.push(row);
    else groups.push([row]);
  }
  const seriesOf = (group: typeof rows): CellSeries => {
    const T = group.length;
    const outcome = new Float64Array(T);
    const spend = Array.from({ length: C }, () => new Float64Array(T));
    const controls = Array.from({ length: K }, () => new Float64Array(T));
    group.forEach((row, t) => {
      outcome[t] = row.outcome;
      for (let c = 0; c < C; c++) spend[c]![t] = row.spend[c] ?? 0;
      for (let k = 0; k < K; k++) controls[k]![t] = row.controls[k] ?? 0;
    });
    const first = group[0]!;
    return { brand: first.brand, market: first.market, firstWeek: first.week, outcome, spend, controls };
  };
  // A gap would break the model's consecutive weeks; saving refuses gaps, so this only guards old data.
  for (const group of groups) {
    for (let t = 1; t < group.length; t++) {
      const step = isoDateToDayNumber(group[t]!.week)! - isoDateToDayNumber(group[t - 1]!.week)!;
      if (step !== 7) throw new Error(`dataset version ${version.number}: ${group[0]!.brand} × ${group[0]!.market} has a gap after ${group[t - 1]!.week}`);
    }
  }
  return {
    versionId,
    versionNumber: version.number,
    data: { channels: [...version.channelCodes], controls: [...version.controlNames], cells: groups.map(seriesOf) },
    cells: groups.map((group) => {
      const first = group[0]!;
      return { cellId: first.cellId, brandId: first.brandId, marketId: first.marketId, brandCode: first.brandCode, marketCode: first.marketCode };
    }),
  };
}
