import type { Flag, PortfolioMap, PortfolioMapCell } from "@tributary/contracts";
import { Link } from "react-router-dom";
import { FlagBadge } from "../../../components/estimate/flag-badge";
import { IntervalBar, logDomainOf, type LogDomain } from "../../../components/estimate/interval-bar";
import { describeShrinkage, ShrinkageMark } from "../../../components/estimate/shrinkage-mark";
import { formatCac, formatChance, formatMoney, formatWeeks } from "../../../lib/format";

type EstimateGridProps = {
  map: PortfolioMap;
  /** Where a cell leads: its Channel sheet for the channel shown. */
  cellHref: (cell: PortfolioMapCell) => string;
};

/** For all channels combined, the mark shows the channel pooling moved furthest: say which. */
function moveLabel(cell: PortfolioMapCell, map: PortfolioMap): string | undefined {
  if (map.channel !== null || !cell.moveChannel) return undefined;
  const name = map.channels.find((channel) => channel.code === cell.moveChannel)?.name ?? cell.moveChannel;
  return `${name}: ${describeShrinkage(cell.pooling.shrinkage)}`;
}

/** The shared log axis of every interval in the grid (and the customer values), so bars compare. */
export function gridDomain(map: PortfolioMap): LogDomain | null {
  return logDomainOf([
    ...map.cells.flatMap((cell) => (cell.cac ? [cell.cac.q05, cell.cac.q95] : [])),
    ...map.cells.map((cell) => cell.customerValue),
  ]);
}

function CellFlags({ cell, flagsById, showChannel }: { cell: PortfolioMapCell; flagsById: Map<string, Flag>; showChannel: boolean }) {
  const flags = cell.flagIds.map((id) => flagsById.get(id)).filter((flag): flag is Flag => flag !== undefined);
  if (flags.length === 0) return null;
  return (
    <span className="flex flex-wrap gap-1">
      {flags.map((flag) => (
        <FlagBadge
          key={flag.id}
          kind={flag.kind}
          channel={showChannel ? flag.channelName : undefined}
          short
          title={`${flag.channelName}: ${flag.note}${flag.createdBy ? ` (${flag.createdBy.name})` : ""}`}
        />
      ))}
    </span>
  );
}

function EstimateCell({ cell, map, domain, flagsById, href }: { cell: PortfolioMapCell; map: PortfolioMap; domain: LogDomain | null; flagsById: Map<string, Flag>; href: string }) {
  const channelName = map.channel ? (map.channels.find((channel) => channel.code === map.channel)?.name ?? map.channel) : null;
  if (!cell.hasSpend || !cell.cac) {
    return (
      <td className="hatch-empty border-b border-l border-line px-3 py-3 align-top text-ink-700">
        <Link to={href} className="block rounded-sm hover:text-stream-700">
          <span className="block text-caption font-medium">{channelName ? `No spend on ${channelName}` : "No media spend"}</span>
          <span className="block text-caption text-ink-600">{formatWeeks(cell.weeks)} of data</span>
        </Link>
        <CellFlags cell={cell} flagsById={flagsById} showChannel={map.channel === null} />
      </td>
    );
  }
  const { cac } = cell;
  return (
    <td className="border-b border-l border-line p-0 align-top" data-cell={`${cell.brand}|${cell.market}`}>
      <Link to={href} className="group block h-full px-2.5 py-2.5 hover:bg-stream-50 focus-visible:bg-stream-50">
        <span className="flex items-baseline justify-between gap-2">
          <span className="text-body font-semibold tabular-nums text-ink-950 group-hover:text-stream-800" data-value="median">
            {formatCac(cac.q50, map.currency)}
          </span>
          {cell.outlier ? (
            <span className="rounded-sm bg-caution-100 px-1 text-caption font-medium text-caution-700" title="A candidate outlier of the pooling review">
              outlier?
            </span>
          ) : null}
        </span>
        <span className="block text-caption tabular-nums text-ink-700" data-value="interval">
          {formatCac(cac.q05, map.currency)}–{formatCac(cac.q95, map.currency)}
        </span>
        {domain ? <IntervalBar className="my-1.5" median={cac.q50} low={cac.q05} high={cac.q95} domain={domain} reference={cell.customerValue} /> : null}
        {cell.probabilityProfitable === null ? (
          <span className="block text-caption text-ink-600">chance of profit: no customer value</span>
        ) : (
          <span className="block text-caption leading-tight text-ink-800">
            <span className="block text-small font-semibold tabular-nums" data-value="chance">
              {formatChance(cell.probabilityProfitable)}
            </span>
            chance of profit
          </span>
        )}
        <span className="mt-1 flex items-center justify-between gap-1 text-caption text-ink-600">
          <span className="whitespace-nowrap tabular-nums">{formatWeeks(cell.weeks)}</span>
          <ShrinkageMark shrinkage={cell.pooling.shrinkage} label={moveLabel(cell, map)} />
        </span>
      </Link>
      <span className="block px-2.5 pb-2 empty:hidden">
        <CellFlags cell={cell} flagsById={flagsById} showChannel={map.channel === null} />
      </span>
    </td>
  );
}

/** Brands × markets: per cell the headline cost per new customer, its chance of profit, data length, shrinkage and flags. */
export function EstimateGrid({ map, cellHref }: EstimateGridProps) {
  const cellByPair = new Map(map.cells.map((cell) => [`${cell.brandId}|${cell.marketId}`, cell]));
  const flagsById = new Map(map.flags.map((flag) => [flag.id, flag]));
  const domain = gridDomain(map);
  return (
    // With few markets the columns keep a readable width instead of stretching across the page.
    <div className="overflow-x-auto rounded-lg border border-line bg-surface shadow-card" style={{ maxWidth: `${8 + map.markets.length * 14}rem` }}>
      <table className="w-full table-fixed border-collapse text-small">
        <caption className="border-b border-line px-4 py-3 text-left">
          <span className="block text-body font-semibold text-ink-900">Brands × markets</span>
          <span className="block text-caption text-ink-600">
            Each cell: the median cost per new customer and its 90 % interval (the bar uses a log scale shared by every cell;
            its upright line is the brand’s customer value), the chance of profit, weeks of data and the shrinkage mark.
            Hatched cells hold no data. Select a cell to open its Channel sheet.
          </span>
        </caption>
        <thead>
          <tr className="bg-ink-50">
            <th scope="col" className="w-32 border-b border-line px-3 py-2 text-left font-semibold text-ink-800">
              Brand
            </th>
            {map.markets.map((market) => (
              <th key={market.id} scope="col" className="border-b border-l border-line px-2.5 py-2 text-left font-semibold text-ink-800">
                {market.name}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {map.brands.map((brand) => (
            <tr key={brand.id}>
              <th scope="row" className="border-b border-line px-3 py-3 text-left align-top font-normal">
                <span className="block font-semibold text-ink-900">{brand.name}</span>
                <span className="block text-caption text-ink-600">
                  {brand.customerValue === null ? "Customer value not set" : `${formatMoney(brand.customerValue, map.currency)} per customer`}
                </span>
              </th>
              {map.markets.map((market) => {
                const cell = cellByPair.get(`${brand.id}|${market.id}`);
                if (!cell) {
                  return (
                    <td key={market.id} className="hatch-empty border-b border-l border-line px-3 py-3 align-top text-ink-600" aria-label={`${brand.name} in ${market.name}: no data`}>
                      <span className="text-caption font-medium">No data</span>
                    </td>
                  );
                }
                return <EstimateCell key={market.id} cell={cell} map={map} domain={domain} flagsById={flagsById} href={cellHref(cell)} />;
              })}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
