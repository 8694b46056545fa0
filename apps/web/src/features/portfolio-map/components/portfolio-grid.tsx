import type { Cell, Portfolio } from "@tributary/contracts";
import { formatMoney, formatWeek, formatWeeks } from "../../../lib/format";

type Span = { start: number; end: number };

function weekTime(isoDate: string): number {
  return Date.parse(`${isoDate.slice(0, 10)}T00:00:00Z`);
}

/** Where each cell's data sits on the portfolio's shared calendar, as fractions 0–1. */
function calendarSpans(cells: Cell[]): { spans: Map<string, Span>; first: string | null; last: string | null } {
  const withData = cells.filter((cell) => cell.weeks > 0 && cell.firstWeek && cell.lastWeek);
  const spans = new Map<string, Span>();
  if (withData.length === 0) return { spans, first: null, last: null };
  const firstWeeks = withData.map((cell) => cell.firstWeek as string).sort();
  const lastWeeks = withData.map((cell) => cell.lastWeek as string).sort();
  const first = firstWeeks[0] as string;
  const last = lastWeeks[lastWeeks.length - 1] as string;
  const t0 = weekTime(first);
  const range = Math.max(weekTime(last) - t0, 1);
  for (const cell of withData) {
    spans.set(cell.id, {
      start: (weekTime(cell.firstWeek as string) - t0) / range,
      end: (weekTime(cell.lastWeek as string) - t0) / range,
    });
  }
  return { spans, first, last };
}

export function PortfolioGrid({ portfolio }: { portfolio: Portfolio }) {
  const cellByPair = new Map(portfolio.cells.map((cell) => [`${cell.brandId}|${cell.marketId}`, cell]));
  const { spans, first, last } = calendarSpans(portfolio.cells);

  return (
    <div className="overflow-x-auto rounded-lg border border-line bg-surface shadow-card">
      <table className="w-full border-collapse text-small">
        <caption className="border-b border-line px-4 py-3 text-left">
          <span className="block text-body font-semibold text-ink-900">Brands × markets</span>
          <span className="block text-caption text-ink-600">
            Weeks of data in each cell
            {first && last ? `; bars place each cell on the shared calendar ${formatWeek(first)} – ${formatWeek(last)}` : ""}.
            Hatched cells hold no data.
          </span>
        </caption>
        <thead>
          <tr className="bg-ink-50">
            <th scope="col" className="w-40 border-b border-line px-4 py-2 text-left font-semibold text-ink-800">
              Brand
            </th>
            {portfolio.markets.map((market) => (
              <th key={market.id} scope="col" className="border-b border-l border-line px-3 py-2 text-left font-semibold text-ink-800">
                {market.name}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {portfolio.brands.map((brand) => (
            <tr key={brand.id}>
              <th scope="row" className="border-b border-line px-4 py-3 text-left align-top font-normal">
                <span className="block font-semibold text-ink-900">{brand.name}</span>
                <span className="block text-caption text-ink-600">
                  {brand.customerValue === null
                    ? "Customer value not set"
                    : `${formatMoney(brand.customerValue, portfolio.currency)} per customer`}
                </span>
              </th>
              {portfolio.markets.map((market) => {
                const cell = cellByPair.get(`${brand.id}|${market.id}`);
                const span = cell ? spans.get(cell.id) : undefined;
                if (!cell || cell.weeks === 0 || !cell.firstWeek || !cell.lastWeek || !span) {
                  return (
                    <td
                      key={market.id}
                      className="hatch-empty border-b border-l border-line px-3 py-3 align-top text-ink-600"
                      aria-label={`${brand.name} in ${market.name}: no data`}
                    >
                      <span className="text-caption font-medium">No data</span>
                    </td>
                  );
                }
                return (
                  <td key={market.id} className="border-b border-l border-line px-3 py-3 align-top">
                    <span className="block text-body font-semibold tabular-nums text-ink-950">{formatWeeks(cell.weeks)}</span>
                    <span className="block text-caption text-ink-600">
                      <span className="whitespace-nowrap">{formatWeek(cell.firstWeek)} –</span>{" "}
                      <span className="whitespace-nowrap">{formatWeek(cell.lastWeek)}</span>
                    </span>
                    <span className="mt-2 block h-1.5 rounded-full bg-ink-100" aria-hidden="true">
                      <span
                        className="block h-1.5 rounded-full bg-stream-600"
                        style={{
                          marginLeft: `${(span.start * 100).toFixed(2)}%`,
                          width: `${(Math.max(span.end - span.start, 0.02) * 100).toFixed(2)}%`,
                        }}
                      />
                    </span>
                  </td>
                );
              })}
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
