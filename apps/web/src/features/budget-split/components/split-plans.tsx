import {
  PLAN_DECISION_COMMENT_MIN_LENGTH,
  planBounds,
  planDeciderRoles,
  planStatusLabels,
  type BudgetSplitPlan,
  type CurrentUser,
  type PlanStatus,
  type PlanSummary,
} from "@tributary/contracts";
import { useQueryClient } from "@tanstack/react-query";
import { useId, useState } from "react";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { Button } from "../../../components/ui/button";
import { ErrorState } from "../../../components/ui/error-state";
import { inputClass } from "../../../components/ui/field";
import { LoadingState } from "../../../components/ui/loading-state";
import { RenameForm } from "../../../components/ui/rename-form";
import { ApiError } from "../../../lib/api-client";
import type { ChannelName } from "../../../lib/channel-names";
import { formatDateTime, formatMoney, formatNumber } from "../../../lib/format";
import { planDecisionInput, useDecidePlan } from "../api/decide-plan";
import { useDeletePlan } from "../api/delete-plan";
import { useBudgetSplits } from "../api/get-budget-splits";
import { planQueryOptions, usePlan } from "../api/get-plan";
import { checkPlanName, useRenamePlan } from "../api/rename-plan";
import { useSubmitPlan } from "../api/submit-plan";
import { useWithdrawPlan } from "../api/withdraw-plan";
import { splitViewOfSaved } from "../split/split-view";
import { SplitResult } from "./split-result";

const statusTone: Record<PlanStatus, string> = {
  draft: "bg-ink-100 text-ink-800",
  submitted: "bg-caution-100 text-caution-700",
  approved: "bg-ok-100 text-ok-700",
  rejected: "bg-alert-100 text-alert-700",
};

export function PlanStatusBadge({ status }: { status: PlanStatus }) {
  return <span className={`inline-block rounded-sm px-1.5 py-0.5 text-caption font-medium ${statusTone[status]}`}>{planStatusLabels[status]}</span>;
}

const messageOf = (error: unknown) => (error instanceof ApiError ? error.message : error instanceof Error ? error.message : "That did not work. Please try again.");

/** Approve, or reject with a comment: for portfolio leads and admins, on a submitted split. */
function DecisionForm({ plan }: { plan: BudgetSplitPlan }) {
  const id = useId();
  const [comment, setComment] = useState("");
  const [error, setError] = useState<string | null>(null);
  const decide = useDecidePlan();
  const send = (decision: "approve" | "reject") => {
    const parsed = planDecisionInput.safeParse({ decision, comment: comment.trim() === "" ? undefined : comment });
    if (!parsed.success) {
      setError(parsed.error.issues[0]?.message ?? "Check the comment");
      return;
    }
    setError(null);
    decide.mutate({ planId: plan.id, ...parsed.data }, { onError: (e) => setError(messageOf(e)) });
  };
  return (
    <form aria-label="Decide on this plan" noValidate onSubmit={(event) => event.preventDefault()} className="rounded-md border border-line bg-paper/50 p-3">
      <label htmlFor={`${id}-comment`} className="block text-small font-medium text-ink-800">
        Comment (required to reject)
      </label>
      <textarea
        id={`${id}-comment`}
        rows={2}
        maxLength={planBounds.comment.max}
        className={`${inputClass} mt-1 w-full`}
        value={comment}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : `${id}-help`}
        onChange={(event) => setComment(event.target.value)}
      />
      <p id={`${id}-help`} className="mt-1 text-caption text-ink-600">
        The author is told by e-mail. A rejection needs at least {PLAN_DECISION_COMMENT_MIN_LENGTH} characters on why.
      </p>
      {error ? (
        <p id={`${id}-error`} role="alert" className="mt-1 text-caption font-medium text-alert-700">
          {error}
        </p>
      ) : null}
      <div className="mt-2 flex gap-2">
        <Button onClick={() => send("approve")} disabled={decide.isPending}>
          Approve
        </Button>
        <Button variant="secondary" onClick={() => send("reject")} disabled={decide.isPending}>
          Reject
        </Button>
      </div>
    </form>
  );
}

/** One saved split: its status, what may be done with it now, and the server's numbers. */
export function SavedSplit({
  planId,
  currency,
  channelName,
  user,
  onClose,
}: {
  planId: string;
  currency: string;
  channelName: ChannelName;
  user: Pick<CurrentUser, "id" | "role">;
  onClose: () => void;
}) {
  const queryClient = useQueryClient();
  const query = usePlan(planId);
  const submit = useSubmitPlan();
  const withdraw = useWithdrawPlan();
  const remove = useDeletePlan();
  const rename = useRenamePlan();
  const [renaming, setRenaming] = useState(false);
  const [confirmDelete, setConfirmDelete] = useState(false);
  if (query.isPending) return <LoadingState label="Loading the plan…" />;
  if (query.isError) return <ErrorState title="The plan could not be loaded" message={query.error.message} onRetry={() => void query.refetch()} />;
  const plan = query.data;
  if (plan.kind !== "budget_split") return <ErrorState title="Not a budget split" message="This plan is a spend scenario; open it in the Spend planner." />;
  const detail = plan.budgetSplit;
  const view = splitViewOfSaved(detail.result, detail.objective, detail.risk);
  const actionError = submit.error ?? withdraw.error ?? remove.error;
  return (
    <section aria-label={`Plan ${plan.name}`} className="space-y-4 rounded-lg border border-line bg-surface p-5 shadow-card">
      <div className="flex items-start justify-between gap-3">
        <div className="min-w-0 flex-1">
          <h3 className="text-heading font-semibold text-ink-900">
            {plan.name} <PlanStatusBadge status={plan.status} />
          </h3>
          <p className="mt-1 text-small text-ink-700">
            {plan.markets.map((m) => m.name).join(", ")} · {plan.cells.length} {plan.cells.length === 1 ? "cell" : "cells"} · saved {formatDateTime(plan.createdAt)}
            {plan.createdBy ? ` by ${plan.createdBy.name}` : ""}
            {plan.submitted ? ` · submitted ${formatDateTime(plan.submitted.at)}${plan.submitted.by ? ` by ${plan.submitted.by.name}` : ""}` : ""}
          </p>
          {plan.note ? <p className="mt-1 text-small text-ink-800">“{plan.note}”</p> : null}
          {!plan.runIsCurrent ? <p className="mt-1 text-small font-medium text-caution-700">Computed on an older fit: a newer fit has been published since.</p> : null}
        </div>
        <Button variant="quiet" onClick={onClose}>
          Close
        </Button>
      </div>
      {plan.decision ? (
        <p role="status" className={`rounded-md px-3 py-2 text-small ${plan.status === "approved" ? "bg-ok-100 text-ok-700" : "bg-alert-100 text-alert-700"}`}>
          {plan.status === "approved" ? "Approved" : "Rejected"} {formatDateTime(plan.decision.at)}
          {plan.decision.by ? ` by ${plan.decision.by.name}` : ""}
          {plan.decision.comment ? `: “${plan.decision.comment}”` : "."}
        </p>
      ) : null}
      <div className="flex flex-wrap items-center gap-2">
        {plan.can.submit ? (
          <Button onClick={() => submit.mutate(plan.id)} disabled={submit.isPending}>
            {submit.isPending ? "Submitting…" : "Submit for approval"}
          </Button>
        ) : null}
        {plan.can.withdraw ? (
          <Button variant="secondary" onClick={() => withdraw.mutate(plan.id)} disabled={withdraw.isPending}>
            Withdraw
          </Button>
        ) : null}
        <a className="rounded-md px-3 py-2 text-small font-medium text-stream-700 hover:bg-stream-50" href={`/api/plans/${encodeURIComponent(plan.id)}/allocation.csv`} download>
          Allocation CSV
        </a>
        <a className="rounded-md px-3 py-2 text-small font-medium text-stream-700 hover:bg-stream-50" href={`/api/plans/${encodeURIComponent(plan.id)}/forecast.csv`} download>
          Weekly forecast CSV
        </a>
        {plan.can.rename && !renaming ? (
          <Button
            variant="quiet"
            onClick={() => {
              rename.reset();
              setRenaming(true);
            }}
          >
            Rename
          </Button>
        ) : null}
        {plan.can.delete ? (
          confirmDelete ? (
            <span className="inline-flex items-center gap-2">
              <span className="text-small text-ink-800">Delete this plan?</span>
              <Button
                variant="secondary"
                onClick={() =>
                  remove.mutate(plan.id, {
                    onSuccess: () => {
                      queryClient.removeQueries({ queryKey: planQueryOptions(plan.id).queryKey });
                      onClose();
                    },
                  })
                }
              >
                Yes, delete
              </Button>
              <Button variant="quiet" onClick={() => setConfirmDelete(false)}>
                Keep
              </Button>
            </span>
          ) : (
            <Button variant="quiet" onClick={() => setConfirmDelete(true)}>
              Delete
            </Button>
          )
        ) : null}
      </div>
      {renaming ? (
        <RenameForm
          currentName={plan.name}
          label={`New name for “${plan.name}”`}
          maxLength={planBounds.name.max}
          check={checkPlanName}
          saving={rename.isPending}
          error={rename.isError ? (rename.error instanceof ApiError ? (rename.error.issues[0]?.message ?? rename.error.message) : messageOf(rename.error)) : null}
          onSave={(name) => rename.mutate({ planId: plan.id, name }, { onSuccess: () => setRenaming(false) })}
          onCancel={() => setRenaming(false)}
        />
      ) : null}
      {plan.status === "submitted" && !plan.can.decide ? (
        <p className="text-small text-ink-700">
          {plan.createdBy?.id === user.id && (planDeciderRoles as readonly string[]).includes(user.role)
            ? "Waiting for another portfolio lead or an admin to approve or reject it: nobody decides on their own plan."
            : "Waiting for a portfolio lead to approve or reject it."}
        </p>
      ) : null}
      {plan.can.decide ? <DecisionForm plan={plan} /> : null}
      {actionError ? (
        <p role="alert" className="text-small font-medium text-alert-700">
          {messageOf(actionError)}
        </p>
      ) : null}
      <SplitResult view={view} currency={currency} channelName={channelName} title={`Saved split ${plan.name}`} />
    </section>
  );
}

/** Every budget split the viewer may see, with its status. */
export function SplitPlans({ currency, openId, onOpen }: { currency: string; openId: string | null; onOpen: (planId: string) => void }) {
  const plans = useBudgetSplits();
  if (plans.isPending) return <LoadingState label="Loading saved splits…" />;
  if (plans.isError) return <ErrorState title="Saved splits could not be loaded" message={plans.error.message} onRetry={() => void plans.refetch()} />;
  const columns: DataTableColumn<PlanSummary>[] = [
    { id: "name", header: "Plan", value: (plan) => plan.name, cell: (plan) => <span className="block min-w-40 font-medium">{plan.name}</span> },
    { id: "status", header: "Status", value: (plan) => planStatusLabels[plan.status], cell: (plan) => <PlanStatusBadge status={plan.status} /> },
    {
      id: "markets",
      header: "Markets",
      value: (plan) => plan.markets.map((m) => m.name).join(", "),
      cell: (plan) => (plan.markets.length > 2 ? <span title={plan.markets.map((m) => m.name).join(", ")}>{plan.markets.length} markets</span> : plan.markets.map((m) => m.name).join(", ")),
    },
    { id: "budget", header: "Budget", value: (plan) => Math.round(plan.spend), cell: (plan) => formatMoney(plan.spend, currency), align: "end" },
    { id: "weeks", header: "Weeks", value: (plan) => plan.horizon, align: "end" },
    {
      id: "gain",
      header: "Customers vs current (median, 90 %)",
      value: (plan) => Number(plan.extraCustomers.q50.toPrecision(4)),
      cell: (plan) => `${plan.extraCustomers.q50 > 0 ? "+" : ""}${formatNumber(plan.extraCustomers.q50, 3)} (${formatNumber(plan.extraCustomers.q05, 3)} to ${formatNumber(plan.extraCustomers.q95, 3)})`,
      align: "end",
    },
    { id: "by", header: "Saved by", value: (plan) => plan.createdBy?.name ?? null },
    { id: "updated", header: "Last change", value: (plan) => plan.updatedAt, cell: (plan) => <span className="whitespace-nowrap">{formatDateTime(plan.updatedAt)}</span> },
    { id: "fit", header: "Fit", value: (plan) => (plan.runIsCurrent ? "current" : "older"), cell: (plan) => (plan.runIsCurrent ? "current" : <span className="text-caution-700">older</span>) },
    {
      id: "open",
      header: "Open",
      value: () => null,
      sortable: false,
      cell: (plan) => (
        <Button variant="secondary" className="whitespace-nowrap px-2! py-1!" onClick={() => onOpen(plan.id)} disabled={openId === plan.id} aria-label={`Open ${plan.name}`}>
          {openId === plan.id ? "Shown below" : "Open"}
        </Button>
      ),
    },
  ];
  return (
    <DataTable
      caption="Saved budget splits"
      rows={plans.data}
      columns={columns}
      rowKey={(plan) => plan.id}
      csvFileName="budget-splits.csv"
      emptyMessage="No budget splits saved yet."
      initialSort={{ id: "updated", desc: true }}
      pageSize={10}
      compact
    />
  );
}
