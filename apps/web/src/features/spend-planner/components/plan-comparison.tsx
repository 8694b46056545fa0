import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { useId, useState } from "react";
import { inputClass } from "../../../components/ui/field";
import { formatMoney, formatNumber, formatWeek } from "../../../lib/format";
import type { PlannerResult } from "../worker/use-planner";
import { extraCustomerCostText } from "./extra-customer-cost";

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

/** A median over its 90 % interval, on two lines. */
function IntervalCell({ summary, signed = false }: { summary: { q05: number; q50: number; q95: number }; signed?: boolean }) {
  const f = (x: number) => (signed && x > 0 ? `+${formatNumber(x, 3)}` : formatNumber(x, 3));
  return (
    <span>
      {f(summary.q50)}
      <span className="block whitespace-nowrap text-caption text-ink-600">
        90 %: {f(summary.q05)} to {f(summary.q95)}
      </span>
    </span>
  );
}

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
          <span className="block whitespace-nowrap text-caption text-ink-600">
            50 %: {formatNumber(row.customers.q25, 3)} to {formatNumber(row.customers.q75, 3)}
          </span>
          <span className="block whitespace-nowrap text-caption text-ink-600">
            90 %: {formatNumber(row.customers.q05, 3)} to {formatNumber(row.customers.q95, 3)}
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
      cell: (row) => (row.extraCustomers ? <IntervalCell summary={row.extraCustomers} signed /> : <span className="text-ink-500">reference</span>),
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
    { id: "extra-customers", header: "Extra customers (median, 90 %)", value: (row) => round(row.extraCustomers.q50), cell: (row) => <IntervalCell summary={row.extraCustomers} signed />, align: "end" },
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

type WeekRow = { week: number; date: string | null; spend: number; q05: number; q25: number; q50: number; q75: number; q95: number };

/** The forecast week by week for one plan at a time, for reading and export. */
export function WeeklyForecastTable({ result, currency, firstWeek }: { result: PlannerResult; currency: string; firstWeek: string | null }) {
  const selectId = useId();
  const plans = [
    { id: "current", name: "Current plan", weeks: result.current.selection.weeks },
    ...result.scenarios.flatMap((s) => (s.ok ? [{ id: s.id, name: s.name, weeks: s.plan.selection.weeks }] : [])),
  ];
  const [chosen, setChosen] = useState("current");
  const plan = plans.find((p) => p.id === chosen) ?? plans[0]!;
  const rows: WeekRow[] = plan.weeks.map((week) => ({
    week: week.planWeek + 1,
    date: firstWeek ? addWeeks(firstWeek, week.planWeek) : null,
    spend: week.spend,
    q05: week.outcome.q05,
    q25: week.outcome.q25,
    q50: week.outcome.q50,
    q75: week.outcome.q75,
    q95: week.outcome.q95,
  }));
  const columns: DataTableColumn<WeekRow>[] = [
    { id: "week", header: "Plan week", value: (row) => row.week, align: "end" },
    ...(firstWeek ? [{ id: "date", header: "Week of", value: (row: WeekRow) => row.date, cell: (row: WeekRow) => (row.date ? formatWeek(row.date) : "–") }] : []),
    { id: "spend", header: "Spend", value: (row) => Math.round(row.spend), cell: (row) => formatMoney(row.spend, currency), align: "end" },
    { id: "median", header: "New customers (median)", value: (row) => round(row.q50), cell: (row) => formatNumber(row.q50, 4), align: "end" },
    { id: "q25", header: "50 % interval", value: (row) => `${round(row.q25)} to ${round(row.q75)}`, cell: (row) => `${formatNumber(row.q25, 4)} to ${formatNumber(row.q75, 4)}`, align: "end", sortable: false },
    { id: "q05", header: "90 % interval", value: (row) => `${round(row.q05)} to ${round(row.q95)}`, cell: (row) => `${formatNumber(row.q05, 4)} to ${formatNumber(row.q95, 4)}`, align: "end", sortable: false },
  ];
  return (
    <div className="space-y-2">
      <div>
        <label htmlFor={selectId} className="text-small font-medium text-ink-800">
          Week by week for
        </label>
        <select id={selectId} className={`${inputClass} ml-2 inline-block w-80 max-w-full`} value={plan.id} onChange={(event) => setChosen(event.target.value)}>
          {plans.map((p) => (
            <option key={p.id} value={p.id}>
              {p.name}
            </option>
          ))}
        </select>
      </div>
      <DataTable
        key={plan.id}
        caption={`Forecast per plan week: ${plan.name}`}
        rows={rows}
        columns={columns}
        rowKey={(row) => String(row.week)}
        csvFileName={`forecast-per-week-${plan.id === "current" ? "current-plan" : "scenario"}.csv`}
        filterable={false}
        pageSize={13}
        compact
      />
    </div>
  );
}

/** The ISO Monday `weeks` weeks after `monday`. */
function addWeeks(monday: string, weeks: number): string {
  const date = new Date(`${monday.slice(0, 10)}T00:00:00Z`);
  date.setUTCDate(date.getUTCDate() + 7 * weeks);
  return date.toISOString().slice(0, 10);
}
