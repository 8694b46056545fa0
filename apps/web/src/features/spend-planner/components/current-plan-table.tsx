import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { Button } from "../../../components/ui/button";
import { inputClass } from "../../../components/ui/field";
import type { ChannelName } from "../../../lib/channel-names";
import { formatMoney } from "../../../lib/format";
import { parseAmount } from "../scenario/scenario-draft";
import type { PlanLine } from "../worker/planner-api";

/** Key of a line (cell × channel) in the edits map. */
export const lineKey = (line: { brand: string; market: string; channel: string }) => `${line.brand}\u0000${line.market}\u0000${line.channel}`;

type Row = PlanLine & { key: string; channelName: string; recentAverage: number; edit: string | undefined };

type CurrentPlanTableProps = {
  lines: PlanLine[];
  recentAverages: number[];
  /** Weekly spend typed per line, as text; a line without an entry keeps its recent average. */
  edits: Record<string, string>;
  onEdit: (key: string, text: string | null) => void;
  currency: string;
  horizon: number;
  channelName: ChannelName;
};

/** The current plan, line by line: each line's recent weekly average, editable. */
export function CurrentPlanTable({ lines, recentAverages, edits, onEdit, currency, horizon, channelName }: CurrentPlanTableProps) {
  const rows: Row[] = lines.map((line, i) => {
    const key = lineKey(line);
    return { ...line, key, channelName: channelName(line.channel), recentAverage: recentAverages[i] ?? 0, edit: edits[key] };
  });
  const columns: DataTableColumn<Row>[] = [
    { id: "cell", header: "Cell", value: (row) => `${row.brand} in ${row.market}` },
    { id: "channel", header: "Channel", value: (row) => row.channelName },
    { id: "recent", header: "Recent weekly average", value: (row) => Math.round(row.recentAverage), cell: (row) => formatMoney(row.recentAverage, currency), align: "end" },
    {
      id: "planned",
      header: "Planned weekly spend",
      value: (row) => (row.edit === undefined ? Math.round(row.recentAverage) : parseAmount(row.edit)),
      sortable: false,
      align: "end",
      cell: (row) => {
        const text = row.edit ?? String(Math.round(row.recentAverage));
        const value = parseAmount(text);
        const invalid = value === null || value < 0;
        return (
          <span className="inline-flex items-center gap-1">
            <input
              inputMode="decimal"
              aria-label={`Planned weekly spend, ${row.channelName} in ${row.brand} ${row.market}`}
              aria-invalid={invalid ? true : undefined}
              title={invalid ? "Enter a weekly spend of 0 or more" : undefined}
              className={`${inputClass} w-28 text-right tabular-nums ${row.edit !== undefined ? "border-stream-700 bg-stream-50" : ""}`}
              value={text}
              onChange={(event) => onEdit(row.key, event.target.value)}
            />
            {row.edit !== undefined ? (
              <Button variant="quiet" className="px-1.5! py-1!" onClick={() => onEdit(row.key, null)} aria-label={`Back to the recent average, ${row.channelName} in ${row.brand} ${row.market}`}>
                Reset
              </Button>
            ) : null}
          </span>
        );
      },
    },
    { id: "total", header: `Over ${horizon} weeks`, value: (row) => Math.round(row.total), cell: (row) => formatMoney(row.total, currency), align: "end" },
  ];
  return <DataTable caption="Current plan per line" rows={rows} columns={columns} rowKey={(row) => row.key} csvFileName="current-plan.csv" compact pageSize={20} />;
}
