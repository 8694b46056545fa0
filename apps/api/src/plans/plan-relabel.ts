// A saved plan names brands and markets the way the planner's draw set does: by display
// name, in its operations' and bounds' targets, a profit objective's customer values and
// the stored result lines. When an admin renames a brand or market, every stored plan is
// relabelled in the same transaction, so a saved plan still opens, exports and compares
// on the current names. Only names change; no number does.
import type { BudgetBoundView, BudgetObjectiveView, LineTargetView, ScenarioOperationView } from "@tributary/contracts";
import type { PlanBody } from "./plan-records";

/** Old name → new name, per kind; names not listed stay. */
export interface NameChanges {
  readonly brands: ReadonlyMap<string, string>;
  readonly markets: ReadonlyMap<string, string>;
}

/** The body with every brand and market name changed as listed, or null when it names none of them. */
export function relabelPlanBody(body: PlanBody, changes: NameChanges): PlanBody | null {
  let changed = false;
  const brand = (name: string) => {
    const next = changes.brands.get(name);
    if (next === undefined || next === name) return name;
    changed = true;
    return next;
  };
  const market = (name: string) => {
    const next = changes.markets.get(name);
    if (next === undefined || next === name) return name;
    changed = true;
    return next;
  };
  const target = <T extends LineTargetView>(t: T | undefined): T | undefined =>
    t === undefined
      ? undefined
      : {
          ...t,
          ...(t.brands ? { brands: t.brands.map(brand) } : {}),
          ...(t.markets ? { markets: t.markets.map(market) } : {}),
          ...(t.cells ? { cells: t.cells.map((c) => ({ ...c, brand: brand(c.brand), market: market(c.market) })) } : {}),
        };
  const withTarget = <T extends { target?: LineTargetView }>(item: T): T => (item.target === undefined ? item : { ...item, target: target(item.target) });

  const scenario = body.scenario && {
    ...body.scenario,
    operations: body.scenario.operations.map((op: ScenarioOperationView) => withTarget(op)),
    headline: { ...body.scenario.headline, cells: body.scenario.headline.cells.map((c) => ({ ...c, brand: brand(c.brand), market: market(c.market) })) },
  };
  const split = body.budgetSplit;
  const objective: BudgetObjectiveView | undefined =
    split?.objective.kind === "profit"
      ? { kind: "profit", customerValue: Object.fromEntries(Object.entries(split.objective.customerValue).map(([name, value]) => [brand(name), value] as const)) }
      : split?.objective;
  const budgetSplit = split && {
    ...split,
    bounds: split.bounds.map((b: BudgetBoundView) => withTarget(b)),
    objective: objective!,
    result: { ...split.result, lines: split.result.lines.map((line) => ({ ...line, brand: brand(line.brand), market: market(line.market) })) },
  };
  const next: PlanBody = { ...body, ...(scenario ? { scenario } : {}), ...(budgetSplit ? { budgetSplit } : {}) };
  return changed ? next : null;
}
