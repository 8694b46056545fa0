import { planBounds, type CurrentUser, type DecodedDrawSet, type Portfolio } from "@tributary/contracts";
import { useId, useMemo, useState, type FormEvent, type ReactNode } from "react";
import { Button } from "../../../components/ui/button";
import { EmptyState } from "../../../components/ui/empty-state";
import { ErrorState } from "../../../components/ui/error-state";
import { describedBy, inputClass } from "../../../components/ui/field";
import { LoadingState } from "../../../components/ui/loading-state";
import { ModelCaution } from "../../../components/ui/model-caution";
import { PageHeader } from "../../../components/ui/page-header";
import { ApiError } from "../../../lib/api-client";
import type { ChannelName } from "../../../lib/channel-names";
import { formatDateTime, formatNumber } from "../../../lib/format";
import { createBudgetSplitPlanInput, useCreateBudgetSplitPlan } from "../api/create-budget-split-plan";
import { useCurrentDrawSet } from "../api/get-current-draw-set";
import { checkSplitForm, currentSpendOver, parseNumber, type SplitFormState, type SplitInputs } from "../split/split-form";
import { splitViewOfResult, type SplitView } from "../split/split-view";
import type { SplitRunner } from "../worker/split-runner";
import { useSplitWorker } from "../worker/use-split";
import { SavedSplit, SplitPlans } from "./split-plans";
import { SplitFormPanel } from "./split-form-panel";
import { SplitResult } from "./split-result";

type BudgetSplitProps = {
  user: CurrentUser;
  portfolio: Portfolio;
  /** Display name of a channel code; codes stay the values. */
  channelName: ChannelName;
  /** A control for PDF reports, composed in by the route. */
  reports?: ReactNode;
  /** Injected in tests; the app splits in a Web Worker. */
  runner?: SplitRunner;
};

type Computed = { view: SplitView; inputs: SplitInputs; elapsedMs: number; drawCount: number };

function initialForm(drawSet: DecodedDrawSet): SplitFormState {
  const current = currentSpendOver(drawSet.cells, drawSet.channels.length, 13, 13);
  return {
    cellIds: drawSet.cells.map((cell) => cell.cellId),
    totalBudget: String(Math.max(1000, Math.round(current / 1000) * 1000)),
    horizon: "13",
    recentWeeks: "13",
    channelBounds: {},
    cellBounds: {},
    objective: "customers",
    risk: "expected",
    quantilePercent: "10",
    penalty: "1",
  };
}

/** Saves the computed split as a draft plan. */
function SaveSplitForm({ computed, runId, onSaved }: { computed: Computed; runId: string; onSaved: (planId: string) => void }) {
  const id = useId();
  const [name, setName] = useState("");
  const [note, setNote] = useState("");
  const [errors, setErrors] = useState<Record<string, string>>({});
  const save = useCreateBudgetSplitPlan();
  const submit = (event: FormEvent) => {
    event.preventDefault();
    const { cells: _names, ...inputs } = computed.inputs;
    const parsed = createBudgetSplitPlanInput.safeParse({
      ...inputs,
      name,
      note: note.trim() === "" ? undefined : note,
      runId,
      allocation: computed.view.lines.map((line) => ({ cellId: line.cellId, channel: line.channel, amount: line.allocation })),
    });
    if (!parsed.success) {
      setErrors(Object.fromEntries(parsed.error.issues.map((issue) => [String(issue.path[0] ?? "form"), issue.message])));
      return;
    }
    setErrors({});
    save.mutate(parsed.data, {
      onSuccess: (plan) => onSaved(plan.id),
      onError: (error) => {
        if (error instanceof ApiError && error.issues.length > 0) setErrors(Object.fromEntries(error.issues.map((issue) => [issue.path.split(".")[0] ?? "form", issue.message])));
      },
    });
  };
  return (
    <form onSubmit={submit} noValidate aria-label="Save the split as a plan" className="rounded-lg border border-line bg-surface p-4 shadow-card">
      <h3 className="text-body font-semibold text-ink-900">Save as a plan</h3>
      <p className="mt-1 text-small text-ink-700">A saved split is a draft until you submit it; a portfolio lead then approves or rejects it.</p>
      <div className="mt-3 flex flex-wrap items-end gap-3">
        <div>
          <label htmlFor={`${id}-name`} className="block text-small font-medium text-ink-800">
            Plan name
          </label>
          <input
            id={`${id}-name`}
            maxLength={planBounds.name.max}
            className={`${inputClass} mt-1 w-72`}
            value={name}
            aria-invalid={errors.name ? true : undefined}
            aria-describedby={describedBy(`${id}-name`, { error: errors.name })}
            onChange={(event) => setName(event.target.value)}
          />
        </div>
        <div className="min-w-64 flex-1">
          <label htmlFor={`${id}-note`} className="block text-small font-medium text-ink-800">
            Note for the approver (optional)
          </label>
          <input id={`${id}-note`} maxLength={planBounds.note.max} className={`${inputClass} mt-1 w-full`} value={note} onChange={(event) => setNote(event.target.value)} />
        </div>
        <Button type="submit" disabled={save.isPending}>
          {save.isPending ? "Saving…" : "Save plan"}
        </Button>
      </div>
      {errors.name ? (
        <p id={`${id}-name-error`} className="mt-1 text-caption font-medium text-alert-700">
          {errors.name}
        </p>
      ) : null}
      {Object.entries(errors)
        .filter(([key]) => key !== "name")
        .map(([key, message]) => (
          <p key={key} className="mt-1 text-caption font-medium text-alert-700">
            {message}
          </p>
        ))}
      {save.isError && !(save.error instanceof ApiError && save.error.issues.length > 0) ? (
        <p role="alert" className="mt-2 text-small font-medium text-alert-700">
          {save.error instanceof ApiError ? save.error.message : "Saving failed. Please try again."}
        </p>
      ) : null}
    </form>
  );
}

function SplitWorkspace({ drawSet, user, portfolio, channelName, runner }: { drawSet: DecodedDrawSet; user: CurrentUser; portfolio: Portfolio; channelName: ChannelName; runner?: SplitRunner }) {
  const [form, setForm] = useState<SplitFormState>(() => initialForm(drawSet));
  const [showErrors, setShowErrors] = useState(false);
  const [computed, setComputed] = useState<Computed | null>(null);
  const [openPlanId, setOpenPlanId] = useState<string | null>(null);
  const [savedMessage, setSavedMessage] = useState<string | null>(null);
  const worker = useSplitWorker(runner);

  const customerValues = useMemo(() => {
    const byId = new Map(portfolio.brands.map((brand) => [brand.id, brand.customerValue]));
    return Object.fromEntries(drawSet.cells.map((cell) => [cell.brand, byId.get(cell.brandId) ?? null]));
  }, [drawSet.cells, portfolio.brands]);
  const check = checkSplitForm(form, drawSet.cells, drawSet.channels, customerValues);
  const horizon = parseNumber(form.horizon);
  const recent = parseNumber(form.recentWeeks);
  const chosen = drawSet.cells.filter((cell) => form.cellIds.includes(cell.cellId));
  const currentSpend =
    horizon !== null && recent !== null && Number.isInteger(horizon) && Number.isInteger(recent) && horizon >= 1 && recent >= 1
      ? currentSpendOver(chosen, drawSet.channels.length, horizon, recent)
      : null;

  const run = () => {
    setShowErrors(true);
    if (!check.ok) return;
    const inputs = check.inputs;
    setSavedMessage(null);
    worker.mutate(
      {
        key: drawSet.runId,
        set: drawSet,
        input: { cells: inputs.cells, totalBudget: inputs.totalBudget, horizon: inputs.horizon, recentWeeks: inputs.recentWeeks, bounds: inputs.bounds, objective: inputs.objective, risk: inputs.risk },
      },
      { onSuccess: (response) => setComputed({ view: splitViewOfResult(response.result, drawSet), inputs, elapsedMs: response.elapsedMs, drawCount: response.drawCount }) },
    );
  };

  return (
    <div className="space-y-8">
      <p className="text-small text-ink-700">
        Computed in your browser from the current fit, published {formatDateTime(drawSet.publishedAt)}, over {formatNumber(drawSet.drawCount)} posterior draws. Amounts in{" "}
        {drawSet.currency}.
      </p>
      <SplitFormPanel
        state={form}
        onChange={setForm}
        cells={drawSet.cells}
        channels={drawSet.channels}
        channelName={channelName}
        currency={drawSet.currency}
        customerValues={customerValues}
        currentSpend={currentSpend}
        errors={check.ok ? {} : check.errors}
        showErrors={showErrors}
        onSubmit={run}
        busy={worker.isPending}
      />
      {worker.isPending ? <LoadingState label="Splitting the budget over the posterior draws…" /> : null}
      {worker.isError ? <ErrorState title="The budget could not be split" message={worker.error.message} /> : null}
      {savedMessage ? (
        <p role="status" className="text-small font-medium text-ok-700">
          {savedMessage}
        </p>
      ) : null}
      {computed && !worker.isPending ? (
        <section aria-labelledby="split-result-title" className="space-y-4">
          <div className="flex flex-wrap items-baseline justify-between gap-3">
            <h2 id="split-result-title" className="text-heading font-semibold text-ink-900">
              The split
            </h2>
            <p className="text-caption text-ink-600" data-split-status="done">
              Computed from {formatNumber(computed.drawCount)} draws in {Math.round(computed.elapsedMs)} ms.
            </p>
          </div>
          <SplitResult view={computed.view} currency={drawSet.currency} channelName={channelName} />
          <SaveSplitForm
            key={computed.elapsedMs}
            computed={computed}
            runId={drawSet.runId}
            onSaved={(planId) => {
              setSavedMessage("Saved as a draft plan; it is open below.");
              setComputed(null);
              setOpenPlanId(planId);
            }}
          />
        </section>
      ) : null}

      <section aria-labelledby="split-plans-title" className="space-y-3">
        <h2 id="split-plans-title" className="text-heading font-semibold text-ink-900">
          Saved budget splits
        </h2>
        <SplitPlans currency={drawSet.currency} openId={openPlanId} onOpen={setOpenPlanId} />
        {openPlanId ? <SavedSplit key={openPlanId} planId={openPlanId} currency={drawSet.currency} channelName={channelName} user={user} onClose={() => setOpenPlanId(null)} /> : null}
      </section>
      {user.role === "admin" || user.role === "portfolio_lead" ? null : (
        <p className="text-caption text-ink-600">Portfolio leads approve or reject submitted splits.</p>
      )}
    </div>
  );
}

/** A total budget split across channels and cells where it is expected to earn most, with its uncertainty. */
export function BudgetSplit({ user, portfolio, channelName, reports, runner }: BudgetSplitProps) {
  const drawSet = useCurrentDrawSet();
  return (
    <>
      <PageHeader title="Budget split" description="Split a total budget across channels and markets where it is expected to earn most." />
      <div className="mb-6">
        <ModelCaution />
      </div>
      {drawSet.isPending ? (
        <LoadingState label="Loading the draws of the current fit…" />
      ) : drawSet.isError ? (
        drawSet.error instanceof ApiError && drawSet.error.status === 404 ? (
          <EmptyState title="No published fit yet">A split needs a published fit. Once an analyst publishes one in Runs, you can split a budget here.</EmptyState>
        ) : (
          <ErrorState title="The current fit's draws could not be loaded" message={drawSet.error.message} onRetry={() => void drawSet.refetch()} />
        )
      ) : drawSet.data.cells.length === 0 ? (
        <EmptyState title="No cells to split a budget over">The current fit has no cells you may see.</EmptyState>
      ) : (
        <SplitWorkspace key={drawSet.data.runId} drawSet={drawSet.data} user={user} portfolio={portfolio} channelName={channelName} runner={runner} />
      )}
      {reports ? <div className="mt-8">{reports}</div> : null}
    </>
  );
}
