// The rows one channel's chart and table show: per brand its own channel effect (when
// the viewer may see it) followed by its cells, in the order the person chose.
import type { BrandComparison, CacInterval, Flag } from "@tributary/contracts";

export type ComparisonSort = "cheapest" | "dearest" | "name";

export const comparisonSortLabels: Record<ComparisonSort, string> = {
  cheapest: "Cheapest first",
  dearest: "Dearest first",
  name: "By name",
};

export type ComparisonLine = {
  /** Unique within a channel: the brand id, or brand id | market id. */
  key: string;
  kind: "brand" | "cell";
  channel: string;
  brandId: string;
  brand: string;
  /** Null on a brand line. */
  cellId: string | null;
  market: string | null;
  interval: CacInterval;
  outlier: boolean;
  flags: Flag[];
  shrinkage: number | null;
  /** Position of the brand in the portfolio's brand list, for its colour. */
  brandIndex: number;
};

type Row = BrandComparison["rows"][number];

const median = (values: number[]) => {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = Math.floor(sorted.length / 2);
  return sorted.length === 0 ? Infinity : sorted.length % 2 === 1 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
};

/** Where a brand sits in the order: its own effect's median, or the median of its cells' medians. */
function brandPosition(row: Row): number {
  return row.brandEffect?.q50 ?? median(row.cells.filter((cell) => cell.hasSpend).map((cell) => cell.cac.q50));
}

function compare(sort: ComparisonSort, a: { name: string; value: number }, b: { name: string; value: number }): number {
  if (sort === "name") return a.name.localeCompare(b.name);
  const byValue = sort === "cheapest" ? a.value - b.value : b.value - a.value;
  return byValue !== 0 && Number.isFinite(byValue) ? byValue : a.name.localeCompare(b.name);
}

/** The lines of one channel, grouped by brand, sorted brands first and cells within each brand. */
export function comparisonLines(data: BrandComparison, channel: string, sort: ComparisonSort): ComparisonLine[] {
  const flagsById = new Map(data.flags.map((flag) => [flag.id, flag]));
  const brandIndex = new Map(data.brands.map((brand, index) => [brand.id, index]));
  const rows = data.rows
    .filter((row) => row.channel === channel)
    .sort((a, b) => compare(sort, { name: a.brand, value: brandPosition(a) }, { name: b.brand, value: brandPosition(b) }));
  const lines: ComparisonLine[] = [];
  for (const row of rows) {
    const index = brandIndex.get(row.brandId) ?? 0;
    if (row.brandEffect) {
      lines.push({
        key: row.brandId,
        kind: "brand",
        channel,
        brandId: row.brandId,
        brand: row.brand,
        cellId: null,
        market: null,
        interval: row.brandEffect,
        outlier: false,
        flags: [],
        shrinkage: null,
        brandIndex: index,
      });
    }
    const cells = row.cells
      .filter((cell) => cell.hasSpend)
      .sort((a, b) => compare(sort, { name: a.market, value: a.cac.q50 }, { name: b.market, value: b.cac.q50 }));
    for (const cell of cells) {
      lines.push({
        key: `${row.brandId}|${cell.marketId}`,
        kind: "cell",
        channel,
        brandId: row.brandId,
        brand: row.brand,
        cellId: cell.cellId,
        market: cell.market,
        interval: cell.cac,
        outlier: cell.outlier,
        flags: cell.flagIds.map((id) => flagsById.get(id)).filter((flag): flag is Flag => flag !== undefined),
        shrinkage: cell.pooling.shrinkage,
        brandIndex: index,
      });
    }
  }
  return lines;
}

/** How a line is named on the chart's axis and in the table. */
export function lineLabel(line: ComparisonLine): string {
  return line.kind === "brand" ? `${line.brand} (whole brand)` : `${line.brand} · ${line.market}`;
}
