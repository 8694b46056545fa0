import type { CurrentUser, DecodedDrawSet, PlanSummary } from "@tributary/contracts";
import { useQueryClient } from "@tanstack/react-query";
import { useMemo, useState } from "react";
import { Button } from "../../../components/ui/button";
import { EmptyState } from "../../../components/ui/empty-state";
import { ErrorState } from "../../../components/ui/error-state";
import { LoadingState } from "../../../components/ui/loading-state";
import { ModelCaution } from "../../../components/ui/model-caution";
import { PageHeader } from "../../../components/ui/page-header";
import { ApiError } from "../../../lib/api-client";
import type { ChannelName } from "../../../lib/channel-names";
import { formatDateTime, formatMoney, formatNumber } from "../../../lib/format";
import { useCurrentDrawSet } from "../api/get-current-draw-set";
import { planQueryOptions } from "../api/get-plan";
import { draftId, fromOperation, newOperation, parseAmount, toOperations, type ScenarioDraft } from "../scenario/scenario-draft";
import type { CurrentPlanEdit, PlannerRequest, PlannerScenario } from "../worker/planner-api";
import type { PlannerRunner } from "../worker/planner-runner";
import { usePlanner } from "../worker/use-planner";
import { CurrentPlanTable, lineKey } from "./current-plan-table";
import { ForecastChart } from "./forecast-chart";
import { CellDifferences, PlanComparison, WeeklyForecastTable } from "./plan-comparison";
import { PlanSetup } from "./plan-setup";
import { SavedScenarios } from "./saved-scenarios";
import { SaveScenarioForm } from "./save-scenario-form";
import { ScenarioEditor } from "./scenario-editor";

type SpendPlannerProps = {
  user: CurrentUser;
  /** Display name of a channel code; codes stay the values. */
  channelName: ChannelName;
  /** Injected in tests; the app runs the forecasts in a Web Worker. */
  runner?: PlannerRunner;
};

const MAX_SCENARIOS = 4;

function weeksError(text: string, what: string, max: number): string | null {
  const value = parseAmount(text);
  if (value === null || !Number.isInteger(value) || value < 1 || value > max) return `${what} must be a whole number from 1 to ${max}`;
  return null;
}

/** Cells chosen at first: every cell when there are few, else those of the first market. */
function initialCells(set: DecodedDrawSet): string[] {
  if (set.cells.length <= 6) return set.cells.map((cell) => cell.cellId);
  const first = [...set.cells].sort((a, b) => a.market.localeCompare(b.market))[0]!.market;
  return set.cells.filter((cell) => cell.market === first).map((cell) => cell.cellId);
}

function firstScenario(set: DecodedDrawSet, horizon: number): ScenarioDraft {
  return { id: draftId("scenario"), name: "Scenario A", operations: [newOperation(horizon, { channel: set.channels[0] ?? "" })] };
}

function PlannerWorkspace({ drawSet, user, channelName, runner }: { drawSet: DecodedDrawSet; user: CurrentUser; channelName: ChannelName; runner?: PlannerRunner }) {
  const queryClient = useQueryClient();
  const [cellIds, setCellIds] = useState<string[]>(() => initialCells(drawSet));
  const [horizonText, setHorizonText] = useState("13");
  const [recentText, setRecentText] = useState("13");
  const [edits, setEdits] = useState<Record<string, string>>({});
  const [scenarios, setScenarios] = useState<ScenarioDraft[]>(() => [firstScenario(drawSet, 13)]);
  const [seed, setSeed] = useState(1);
  const [opening, setOpening] = useState<string | null>(null);
  const [openMessage, setOpenMessage] = useState<{ tone: "ok" | "alert"; text: string } | null>(null);

  const horizonError = weeksError(horizonText, "Weeks to plan", 156);
  const recentError = weeksError(recentText, "Recent weeks", 156);
  const horizon = horizonError ? null : Number(parseAmount(horizonText));
  const chosen = drawSet.cells.filter((cell) => cellIds.includes(cell.cellId));
  const choices = useMemo(
    () => ({
      channels: drawSet.channels,
      markets: [...new Set(chosen.map((cell) => cell.market))],
      brands: [...new Set(chosen.map((cell) => cell.brand))],
    }),
    [chosen, drawSet.channels],
  );

  // Edits of lines still in the plan; an edit that is not a number ≥ 0 holds the forecast back.
  const currentEdits: CurrentPlanEdit[] | null = useMemo(() => {
    const out: CurrentPlanEdit[] = [];
    for (const cell of chosen) {
      for (const channel of drawSet.channels) {
        const text = edits[lineKey({ brand: cell.brand, market: cell.market, channel })];
        if (text === undefined) continue;
        const weekly = parseAmount(text);
        if (weekly === null || weekly < 0) return null;
        out.push({ brand: cell.brand, market: cell.market, channel, weekly });
      }
    }
    return out;
  }, [chosen, drawSet.channels, edits]);

  const checked = useMemo(() => (horizon === null ? [] : scenarios.map((scenario) => ({ scenario, ...toOperations(scenario, horizon) }))), [horizon, scenarios]);
  const plannerScenarios: PlannerScenario[] = checked.flatMap(({ scenario, operations }) =>
    operations && scenario.name.trim() !== "" ? [{ id: scenario.id, name: scenario.name.trim(), operations }] : [],
  );
  const request: PlannerRequest | null =
    horizon === null || recentError || chosen.length === 0 || currentEdits === null
      ? null
      : {
          cells: chosen.map((cell) => ({ brand: cell.brand, market: cell.market })),
          horizon,
          recentWeeks: Number(parseAmount(recentText)),
          currentEdits,
          scenarios: plannerScenarios,
          seed,
        };
  const loadedSet = useMemo(() => ({ key: drawSet.runId, set: drawSet }), [drawSet]);
  const planner = usePlanner(loadedSet, request, { runner });
  const result = planner.result;
  const scenarioProblem = (id: string) => {
    const found = result?.scenarios.find((s) => s.id === id);
    return found && !found.ok ? found.message : null;
  };
  const firstWeeks = new Set(result?.current.cells.map((cell) => cell.firstWeek));
  const sharedFirstWeek = firstWeeks.size === 1 ? [...firstWeeks][0]! : null;

  const saveInput = (scenario: ScenarioDraft) => {
    const ops = checked.find((c) => c.scenario.id === scenario.id)?.operations;
    if (!ops || horizon === null || recentError || currentEdits === null || chosen.length === 0) return null;
    const editOps = currentEdits.map((edit) => ({
      kind: "set" as const,
      target: { cells: [{ brand: edit.brand, market: edit.market }], channels: [edit.channel] },
      weekly: edit.weekly,
    }));
    return { runId: drawSet.runId, cellIds: chosen.map((cell) => cell.cellId), horizon, recentWeeks: Number(parseAmount(recentText)), operations: [...editOps, ...ops], seed };
  };

  async function openSaved(summary: PlanSummary) {
    setOpening(summary.id);
    setOpenMessage(null);
    try {
      const plan = await queryClient.fetchQuery(planQueryOptions(summary.id));
      if (plan.kind !== "scenario") throw new Error("That plan is not a spend scenario.");
      const known = plan.cells.filter((cell) => drawSet.cells.some((c) => c.cellId === cell.cellId));
      if (known.length === 0) throw new Error("None of this scenario's cells is in the current fit.");
      const detail = plan.scenario;
      setCellIds(known.map((cell) => cell.cellId));
      setHorizonText(String(detail.horizon));
      setRecentText(String(detail.recentWeeks));
      setSeed(detail.seed);
      setEdits({});
      setScenarios([{ id: draftId("scenario"), name: plan.name, operations: detail.operations.map((op) => fromOperation(op, detail.horizon)) }]);
      const missing = plan.cells.length - known.length;
      setOpenMessage({
        tone: "ok",
        text: `Opened “${plan.name}”${plan.runIsCurrent ? "" : ", saved on an older fit; the numbers below are recomputed on the current fit"}${missing > 0 ? `; ${missing} of its cells are not in the current fit and were left out` : ""}.`,
      });
    } catch (error) {
      setOpenMessage({ tone: "alert", text: error instanceof Error ? error.message : "The scenario could not be opened." });
    } finally {
      setOpening(null);
    }
  }

  return (
    <div className="space-y-8">
      <p className="text-small text-ink-700">
        Computed from the current fit, published {formatDateTime(drawSet.publishedAt)}, over {formatNumber(drawSet.drawCount)} posterior draws. Amounts in {drawSet.currency}.
      </p>
      <PlanSetup
        cells={drawSet.cells}
        selected={cellIds}
        onSelect={setCellIds}
        horizon={horizonText}
        onHorizon={setHorizonText}
        horizonError={horizonError}
        recentWeeks={recentText}
        onRecentWeeks={setRecentText}
        recentWeeksError={recentError}
      />

      <section aria-labelledby="current-plan-title" className="space-y-3">
        <div className="flex flex-wrap items-end justify-between gap-3">
          <div>
            <h2 id="current-plan-title" className="text-heading font-semibold text-ink-900">
              Current plan
            </h2>
            <p className="mt-1 max-w-3xl text-small text-ink-700">
              Each line keeps its average weekly spend of the recent weeks. Change a line's weekly spend to plan from a different starting point; scenarios start
              from this plan and are compared with it.
            </p>
          </div>
          {Object.keys(edits).length > 0 ? (
            <Button variant="secondary" onClick={() => setEdits({})}>
              Undo every edit
            </Button>
          ) : null}
        </div>
        {result ? (
          <CurrentPlanTable
            lines={result.current.lines}
            recentAverages={result.current.recentAverages}
            edits={edits}
            onEdit={(key, text) =>
              setEdits((previous) => {
                const next = { ...previous };
                if (text === null) delete next[key];
                else next[key] = text;
                return next;
              })
            }
            currency={drawSet.currency}
            horizon={result.current.selection.weeks.length}
            channelName={channelName}
          />
        ) : planner.status === "failed" ? null : (
          <LoadingState label="Working out the current plan…" />
        )}
        {currentEdits === null ? <p className="text-small font-medium text-alert-700">Every planned weekly spend must be a number of 0 or more.</p> : null}
      </section>

      <section aria-labelledby="scenarios-title" className="space-y-3">
        <h2 id="scenarios-title" className="text-heading font-semibold text-ink-900">
          Scenarios
        </h2>
        <p className="max-w-3xl text-small text-ink-700">
          Change the current plan per channel, market or brand: multiply its spend, add to it, stop it, or set a weekly amount, for all plan weeks or some.
        </p>
        {scenarios.map((scenario) => (
          <div key={scenario.id}>
            <ScenarioEditor
              scenario={scenario}
              horizon={horizon ?? 13}
              choices={choices}
              channelName={channelName}
              onChange={(next) => setScenarios((list) => list.map((s) => (s.id === scenario.id ? next : s)))}
              onRemove={scenarios.length > 1 ? () => setScenarios((list) => list.filter((s) => s.id !== scenario.id)) : undefined}
              problem={scenarioProblem(scenario.id)}
            />
            <SaveScenarioForm key={scenario.id} input={saveInput(scenario)} defaultName={scenario.name} hasCurrentEdits={(currentEdits?.length ?? 0) > 0} />
          </div>
        ))}
        <Button
          variant="secondary"
          disabled={scenarios.length >= MAX_SCENARIOS}
          onClick={() =>
            setScenarios((list) => [
              ...list,
              { id: draftId("scenario"), name: `Scenario ${String.fromCharCode(65 + list.length)}`, operations: [newOperation(horizon ?? 13)] },
            ])
          }
        >
          Add a scenario
        </Button>
        {scenarios.length >= MAX_SCENARIOS ? <p className="text-caption text-ink-600">Up to {MAX_SCENARIOS} scenarios side by side.</p> : null}
      </section>

      <section aria-labelledby="forecast-title" className="space-y-4" aria-busy={planner.status === "running"}>
        <div className="flex flex-wrap items-baseline justify-between gap-3">
          <h2 id="forecast-title" className="text-heading font-semibold text-ink-900">
            Forecast and comparison
          </h2>
          <p className="text-caption text-ink-600" data-planner-status={planner.status} aria-live="polite">
            {planner.status === "running"
              ? "Updating the forecast…"
              : planner.status === "done" && result
                ? `Computed in the browser from ${formatNumber(result.drawCount)} draws in ${Math.round(result.elapsedMs)} ms.`
                : ""}
          </p>
        </div>
        {planner.status === "failed" && planner.message ? <ErrorState title="The forecast could not be computed" message={planner.message} /> : null}
        {result ? (
          <div className={`space-y-6 ${planner.stale ? "opacity-60" : ""}`}>
            <dl className="grid gap-3 sm:grid-cols-3">
              <div className="rounded-md border border-line bg-surface p-3">
                <dt className="text-caption text-ink-600">Current plan: spend over {result.current.selection.weeks.length} weeks</dt>
                <dd className="text-heading font-semibold text-ink-900">{formatMoney(result.current.selection.totalSpend, drawSet.currency)}</dd>
              </div>
              <div className="rounded-md border border-line bg-surface p-3">
                <dt className="text-caption text-ink-600">Current plan: new customers (median)</dt>
                <dd className="text-heading font-semibold text-ink-900">{formatNumber(result.current.selection.total.q50, 4)}</dd>
                <dd className="text-caption text-ink-600">
                  90 %: {formatNumber(result.current.selection.total.q05, 3)} to {formatNumber(result.current.selection.total.q95, 3)}
                </dd>
              </div>
              <div className="rounded-md border border-line bg-surface p-3">
                <dt className="text-caption text-ink-600">Cells planned</dt>
                <dd className="text-heading font-semibold text-ink-900">{result.current.cells.length}</dd>
              </div>
            </dl>
            <ForecastChart
              current={{ name: "Current plan", weeks: result.current.selection.weeks }}
              scenarios={result.scenarios.flatMap((s) => (s.ok ? [{ name: s.name, weeks: s.plan.selection.weeks }] : []))}
              firstWeek={sharedFirstWeek}
            />
            <PlanComparison result={result} currency={drawSet.currency} horizon={result.current.selection.weeks.length} />
            <ModelCaution />
            <CellDifferences result={result} currency={drawSet.currency} />
            <WeeklyForecastTable result={result} currency={drawSet.currency} firstWeek={sharedFirstWeek} />
            <p className="text-caption text-ink-600">{result.current.note}</p>
          </div>
        ) : null}
      </section>

      <section aria-labelledby="saved-title" className="space-y-3">
        <h2 id="saved-title" className="text-heading font-semibold text-ink-900">
          Saved scenarios
        </h2>
        {openMessage ? (
          <p role={openMessage.tone === "alert" ? "alert" : "status"} className={`text-small font-medium ${openMessage.tone === "alert" ? "text-alert-700" : "text-ok-700"}`}>
            {openMessage.text}
          </p>
        ) : null}
        <SavedScenarios user={user} currency={drawSet.currency} onOpen={(plan) => void openSaved(plan)} opening={opening} />
      </section>
    </div>
  );
}

/** Spend scenarios for the weeks ahead against the current plan, computed in the browser from the current fit's draws. */
export function SpendPlanner({ user, channelName, runner }: SpendPlannerProps) {
  const drawSet = useCurrentDrawSet();
  const scoped = user.role === "market_manager";
  return (
    <>
      <PageHeader title="Spend planner" description="Try spend changes for the weeks ahead and see what the model expects, with its uncertainty." />
      {scoped ? <p className="mb-4 text-small text-ink-700">You see and plan your own markets only.</p> : null}
      <div className="mb-6">
        <ModelCaution />
      </div>
      {drawSet.isPending ? (
        <LoadingState label="Loading the draws of the current fit…" />
      ) : drawSet.isError ? (
        drawSet.error instanceof ApiError && drawSet.error.status === 404 ? (
          <EmptyState title="No published fit yet">
            Planning needs a published fit. Once an analyst publishes one in Runs, you can plan here.
          </EmptyState>
        ) : (
          <ErrorState title="The current fit's draws could not be loaded" message={drawSet.error.message} onRetry={() => void drawSet.refetch()} />
        )
      ) : drawSet.data.cells.length === 0 ? (
        <EmptyState title="No cells to plan">The current fit has no cells in your markets.</EmptyState>
      ) : (
        <PlannerWorkspace key={drawSet.data.runId} drawSet={drawSet.data} user={user} channelName={channelName} runner={runner} />
      )}
    </>
  );
}
