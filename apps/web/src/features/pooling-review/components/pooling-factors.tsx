import type { PoolingReview } from "@tributary/contracts";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { formatNumber } from "../../../lib/format";
import { poolingReviewCsvHref } from "../api/get-pooling-review";

type LevelRow = { level: "brand" | "market" | "cell"; factors: Map<string, number | null> };

const levelLabels: Record<LevelRow["level"], string> = { brand: "Brands", market: "Markets", cell: "Cells (own deviation)" };

/** Pooling factors per level and channel: levels as rows, channels as columns. */
export function PoolingFactors({ review, runId }: { review: PoolingReview; runId: string | null }) {
  const levels = (["brand", "market", "cell"] as const).filter((level) => review.poolingFactors.some((factor) => factor.level === level));
  const rows: LevelRow[] = levels.map((level) => ({
    level,
    factors: new Map(review.poolingFactors.filter((factor) => factor.level === level).map((factor) => [factor.channel, factor.poolingFactor])),
  }));
  const columns: DataTableColumn<LevelRow>[] = [
    { id: "level", header: "Level", value: (row) => levelLabels[row.level] },
    ...review.channels.map(
      (channel): DataTableColumn<LevelRow> => ({
        id: channel.channel,
        header: channel.name,
        value: (row) => {
          const value = row.factors.get(channel.channel);
          return value === null || value === undefined ? null : Number(value.toFixed(3));
        },
        cell: (row) => {
          const value = row.factors.get(channel.channel) ?? null;
          if (value === null) return <span className="text-ink-500">–</span>;
          return (
            <span className="inline-flex items-center justify-end gap-2">
              <span className="h-1.5 w-12 rounded-full bg-ink-100" aria-hidden="true">
                <span className="block h-1.5 rounded-full bg-stream-600" style={{ width: `${Math.round(Math.min(1, Math.max(0, value)) * 100)}%` }} />
              </span>
              {formatNumber(value, 2)}
            </span>
          );
        },
        align: "end",
      }),
    ),
  ];
  return (
    <div className="space-y-2">
      <DataTable
        caption="Pooling factors"
        rows={rows}
        columns={columns}
        rowKey={(row) => row.level}
        csvFileName="pooling-factors.csv"
        csvHref={poolingReviewCsvHref("pooling-factors", runId)}
        compact
      />
      <p className="max-w-3xl text-caption text-ink-600">
        The pooling factor λ = 1 − Var(E[ε]) / E[Var(ε)] of a level’s deviations ε (Gelman &amp; Pardoe 2006): near 0, the data of each brand, market or
        cell decide its deviation; near 1, the deviations are pulled almost entirely to the portfolio’s.
      </p>
    </div>
  );
}
