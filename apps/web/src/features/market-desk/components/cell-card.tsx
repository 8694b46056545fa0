import type { Flag, MarketDesk } from "@tributary/contracts";
import { Link } from "react-router-dom";
import { FlagBadge } from "../../../components/estimate/flag-badge";
import { IntervalBar, type LogDomain } from "../../../components/estimate/interval-bar";
import { ShrinkageMark } from "../../../components/estimate/shrinkage-mark";
import { formatCac, formatChance, formatMoney, formatWeek, formatWeeks } from "../../../lib/format";

type DeskCell = MarketDesk["cells"][number];

type CellCardProps = {
  cell: DeskCell;
  currency: string;
  domain: LogDomain | null;
  flagsById: Map<string, Flag>;
  channelSheetHref: (selection: { cellId: string; channel: string }) => string;
};

/** One brand in one market: its channels with their cost per new customer, chance of profit, shrinkage and flags. */
export function CellCard({ cell, currency, domain, flagsById, channelSheetHref }: CellCardProps) {
  return (
    <div className="overflow-hidden rounded-lg border border-line bg-surface shadow-card">
      <table className="w-full border-collapse text-small">
        <caption className="border-b border-line bg-ink-50 px-4 py-2.5 text-left">
          <span className="block text-body font-semibold text-ink-950">
            {cell.brand} in {cell.market}
          </span>
          <span className="block text-caption text-ink-600">
            {cell.customerValue === null ? "Customer value not set" : `${formatMoney(cell.customerValue, currency)} per customer`} ·{" "}
            {formatWeeks(cell.weeks)} of data to {formatWeek(cell.lastWeek)}
          </span>
        </caption>
        <thead className="sr-only">
          <tr>
            <th scope="col">Channel</th>
            <th scope="col">Median and 90 % interval</th>
            <th scope="col">Chance of profit</th>
            <th scope="col">Shrinkage and flags</th>
          </tr>
        </thead>
        <tbody>
          {cell.channels.map((estimate) => {
            const flags = estimate.flagIds.map((id) => flagsById.get(id)).filter((flag): flag is Flag => flag !== undefined);
            return (
              <tr key={estimate.channel} className="border-b border-line last:border-b-0">
                <th scope="row" className="w-28 px-4 py-2 text-left align-top font-medium">
                  <Link to={channelSheetHref({ cellId: cell.cellId, channel: estimate.channel })} className="text-stream-700 underline decoration-stream-200 underline-offset-2 hover:decoration-stream-700">
                    {estimate.channelName}
                  </Link>
                </th>
                {estimate.hasSpend ? (
                  <>
                    <td className="px-2 py-2 align-top">
                      <span className="block tabular-nums text-ink-950">
                        <span className="font-semibold">{formatCac(estimate.cac.q50, currency)}</span>{" "}
                        <span className="text-caption text-ink-700">
                          ({formatCac(estimate.cac.q05, currency)}–{formatCac(estimate.cac.q95, currency)})
                        </span>
                      </span>
                      {domain ? <IntervalBar className="mt-1" median={estimate.cac.q50} low={estimate.cac.q05} high={estimate.cac.q95} domain={domain} reference={cell.customerValue} /> : null}
                    </td>
                    <td className="w-32 whitespace-nowrap px-2 py-2 text-right align-top tabular-nums">
                      {estimate.probabilityProfitable === null ? (
                        <span className="text-caption text-ink-500">no customer value</span>
                      ) : (
                        <>
                          <span className="block font-semibold">{formatChance(estimate.probabilityProfitable)}</span>
                          <span className="block text-caption text-ink-600">chance of profit</span>
                        </>
                      )}
                    </td>
                  </>
                ) : (
                  <td colSpan={2} className="hatch-empty px-2 py-2 align-top text-caption text-ink-700">
                    No spend on {estimate.channelName}
                  </td>
                )}
                <td className="w-20 px-3 py-2 align-top">
                  <span className="flex flex-col items-end gap-1">
                    {estimate.hasSpend ? <ShrinkageMark shrinkage={estimate.pooling.shrinkage} /> : null}
                    {estimate.outlier ? <span className="rounded-sm bg-caution-100 px-1 text-caption font-medium text-caution-700">outlier?</span> : null}
                    {flags.map((flag) => (
                      <FlagBadge key={flag.id} kind={flag.kind} compact title={`${flag.note}${flag.createdBy ? ` (${flag.createdBy.name})` : ""}`} />
                    ))}
                  </span>
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
