import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { formatMoney, formatNumber } from "../../../lib/format";
import type { PlannerResult } from "../worker/use-planner";
import { extraCustomerCostText, intervalText } from "./extra-customer-cost";

type ComparisonRow = {
  id: string;
  name: string;
  spend: number;
  customers: { q05: number; q25: number; q50: number; q75: number; q95: number };
  extraSpend: number | null;
  extraCustomers: { q05: number; q50: number; q95: number } | null;
  cost: { headline: string; detail: string } | null;
};

const round = (x: number) => Number(x.toPrecision(4));

/** The scenarios side by side against the current plan: spend, customers, and the difference with intervals. */
export function PlanComparison({ result, currency, horizon }: { result: PlannerResult; currency: string; horizon: number }) {
  const rows: ComparisonRow[] = [
    {
      id: "current",
      name: "Current plan",
      spend: result.current.selection.totalSpend,
      customers: result.current.selection.total,
      extraSpend: null,
      extraCustomers: null,
      cost: null,
    },
    ...result.scenarios.flatMap((scenario): ComparisonRow[] =>
      scenario.ok
        ? [
            {
              id: scenario.id,
              name: scenario.name,
              spend: scenario.plan.selection.totalSpend,
              customers: scenario.plan.selection.total,
              extraSpend: scenario.selection.extraSpend,
              extraCustomers: scenario.selection.extraCustomers,
              cost: extraCustomerCostText(scenario.selection.costPerExtraCustomer, currency),
            },
          ]
        : [],
    ),
  ];
  const columns: DataTableColumn<ComparisonRow>[] = [
    { id: "plan", header: "Plan", value: (row) => row.name, cell: (row) => <span className="font-medium">{row.name}</span> },
    { id: "spend", header: `Spend over ${horizon} weeks`, value: (row) => Math.round(row.spend), cell: (row) => formatMoney(row.spend, currency), align: "end" },
    {
      id: "customers",
      header: "New customers (median)",
      value: (row) => round(row.customers.q50),
      cell: (row) => (
        <span>
          {formatNumber(row.customers.q50, 4)}
          <span className="block text-caption text-ink-600">
            50 %: {formatNumber(row.customers.q25, 3)}–{formatNumber(row.customers.q75, 3)} · 90 %: {formatNumber(row.customers.q05, 3)}–{formatNumber(row.customers.q95, 3)}
          </span>
        </span>
      ),
      align: "end",
    },
    { id: "customers-q05", header: "New customers, 5 %", value: (row) => round(row.customers.q05), csvOnly: true },
    { id: "customers-q95", header: "New customers, 95 %", value: (row) => round(row.customers.q95), csvOnly: true },
    {
      id: "extra-spend",
      header: "Extra spend",
      value: (row) => (row.extraSpend === null ? null : Math.round(row.extraSpend)),
      cell: (row) => (row.extraSpend === null ? <span className="text-ink-500">reference</span> : `${row.extraSpend > 0 ? "+" : ""}${formatMoney(row.extraSpend, currency)}`),
      align: "end",
    },
    {
      id: "extra-customers",
      header: "Extra customers (median, 90 %)",
      value: (row) => (row.extraCustomers ? round(row.extraCustomers.q50) : null),
      cell: (row) => (row.extraCustomers ? intervalText(row.extraCustomers, true) : <span className="text-ink-500">reference</span>),
      align: "end",
    },
    { id: "extra-q05", header: "Extra customers, 5 %", value: (row) => (row.extraCustomers ? round(row.extraCustomers.q05) : null), csvOnly: true },
    { id: "extra-q95", header: "Extra customers, 95 %", value: (row) => (row.extraCustomers ? round(row.extraCustomers.q95) : null), csvOnly: true },
    {
      id: "cost",
      header: "Cost per extra customer",
      value: (row) => (row.cost ? `${row.cost.headline} (${row.cost.detail})` : null),
      sortable: false,
      cell: (row) =>
        row.cost ? (
          <span>
            <span className="font-medium">{row.cost.headline}</span>
            <span className="block max-w-xs text-caption text-ink-600">{row.cost.detail}</span>
          </span>
        ) : (
          <span className="text-ink-500">reference</span>
        ),
    },
  ];
  return (
    <DataTable
      caption="Scenarios against the current plan"
      rows={rows}
      columns={columns}
      rowKey={(row) => row.id}
      csvFileName="scenario-comparison.csv"
      filterable={false}
    />
  );
}

type CellRow = {
  key: string;
  scenario: string;
  cell: string;
  extraSpend: number;
  extraCustomers: { q05: number; q50: number; q95: number };
  cost: { headline: string; detail: string };
};

/** Each scenario's difference from the current plan, cell by cell. */
export function CellDifferences({ result, currency }: { result: PlannerResult; currency: string }) {
  const rows: CellRow[] = result.scenarios.flatMap((scenario) =>
    scenario.ok
      ? scenario.cells.map((cell) => ({
          key: `${scenario.id}-${cell.brand}-${cell.market}`,
          scenario: scenario.name,
          cell: `${cell.brand} in ${cell.market}`,
          extraSpend: cell.extraSpend,
          extraCustomers: cell.extraCustomers,
          cost: extraCustomerCostText(cell.costPerExtraCustomer, currency),
        }))
      : [],
  );
  const columns: DataTableColumn<CellRow>[] = [
    { id: "scenario", header: "Scenario", value: (row) => row.scenario },
    { id: "cell", header: "Cell", value: (row) => row.cell },
    { id: "extra-spend", header: "Extra spend", value: (row) => Math.round(row.extraSpend), cell: (row) => `${row.extraSpend > 0 ? "+" : ""}${formatMoney(row.extraSpend, currency)}`, align: "end" },
    { id: "extra-customers", header: "Extra customers (median, 90 %)", value: (row) => round(row.extraCustomers.q50), cell: (row) => intervalText(row.extraCustomers, true), align: "end" },
    { id: "extra-q05", header: "Extra customers, 5 %", value: (row) => round(row.extraCustomers.q05), csvOnly: true },
    { id: "extra-q95", header: "Extra customers, 95 %", value: (row) => round(row.extraCustomers.q95), csvOnly: true },
    {
      id: "cost",
      header: "Cost per extra customer",
      value: (row) => `${row.cost.headline} (${row.cost.detail})`,
      sortable: false,
      cell: (row) => (
        <span title={row.cost.detail}>
          {row.cost.headline}
          {row.cost.headline === "Not defined" ? <span className="block text-caption text-ink-600">may bring no extra customers</span> : <span className="block text-caption text-ink-600">{row.cost.detail}</span>}
        </span>
      ),
    },
  ];
  return (
    <DataTable
      caption="Differences per cell"
      rows={rows}
      columns={columns}
      rowKey={(row) => row.key}
      csvFileName="scenario-differences-per-cell.csv"
      emptyMessage="No scenario to compare yet."
      pageSize={15}
      compact
    />
  );
}

type WeekRow = { week: number; values: ({ q05: number; q50: number; q95: number; spend: number } | null)[] };

/** The forecast week by week for every plan, for reading and export. */
export function WeeklyForecastTable({ result, currency }: { result: PlannerResult; currency: string }) {
  const plans = [
    { name: "Current plan", weeks: result.current.selection.weeks },
    ...result.scenarios.flatMap((s) => (s.ok ? [{ name: s.name, weeks: s.plan.selection.weeks }] : [])),
  ];
  const rows: WeekRow[] = result.current.selection.weeks.map((week, h) => ({
    week: week.planWeek + 1,
    values: plans.map((plan) => {
      const w = plan.weeks[h];
      return w ? { q05: w.outcome.q05, q50: w.outcome.q50, q95: w.outcome.q95, spend: w.spend } : null;
    }),
  }));
  const columns: DataTableColumn<WeekRow>[] = [
    { id: "week", header: "Plan week", value: (row) => row.week, align: "end" },
    ...plans.flatMap((plan, p): DataTableColumn<WeekRow>[] => [
      { id: `spend-${p}`, header: `${plan.name}: spend`, value: (row) => (row.values[p] ? Math.round(row.values[p]!.spend) : null), cell: (row) => (row.values[p] ? formatMoney(row.values[p]!.spend, currency) : "–"), align: "end" },
      { id: `median-${p}`, header: `${plan.name}: new customers`, value: (row) => (row.values[p] ? round(row.values[p]!.q50) : null), cell: (row) => (row.values[p] ? intervalText(row.values[p]!) : "–"), align: "end" },
      { id: `q05-${p}`, header: `${plan.name}: 5 %`, value: (row) => (row.values[p] ? round(row.values[p]!.q05) : null), csvOnly: true },
      { id: `q95-${p}`, header: `${plan.name}: 95 %`, value: (row) => (row.values[p] ? round(row.values[p]!.q95) : null), csvOnly: true },
    ]),
  ];
  return <DataTable caption="Forecast per plan week" rows={rows} columns={columns} rowKey={(row) => String(row.week)} csvFileName="forecast-per-week.csv" filterable={false} pageSize={13} compact />;
}
