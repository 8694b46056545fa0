import { planBounds, planStatusLabels, type CurrentUser, type PlanSummary } from "@tributary/contracts";
import { useState } from "react";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { Button } from "../../../components/ui/button";
import { ErrorState } from "../../../components/ui/error-state";
import { LoadingState } from "../../../components/ui/loading-state";
import { RenameForm } from "../../../components/ui/rename-form";
import { ApiError } from "../../../lib/api-client";
import { formatDateTime, formatMoney, formatNumber } from "../../../lib/format";
import { useDeletePlan } from "../api/delete-plan";
import { useSavedPlans } from "../api/get-saved-plans";
import { checkPlanName, useRenamePlan } from "../api/rename-plan";

type SavedScenariosProps = {
  user: CurrentUser;
  currency: string;
  onOpen: (plan: PlanSummary) => void;
  opening: string | null;
};

/** Scenarios saved by anyone who can see the same markets. */
export function SavedScenarios({ user, currency, onOpen, opening }: SavedScenariosProps) {
  const plans = useSavedPlans({ kind: "scenario" });
  const remove = useDeletePlan();
  const [confirming, setConfirming] = useState<string | null>(null);
  const rename = useRenamePlan();
  const [renaming, setRenaming] = useState<string | null>(null);
  const [renamed, setRenamed] = useState<{ from: string; to: string } | null>(null);

  if (plans.isPending) return <LoadingState label="Loading saved scenarios…" />;
  if (plans.isError) return <ErrorState title="Saved scenarios could not be loaded" message={plans.error.message} onRetry={() => void plans.refetch()} />;

  // The server decides; these mirror its rules (the author or an admin) to offer only what it allows.
  const mayDelete = (plan: PlanSummary) => user.role === "admin" || plan.createdBy?.id === user.id;
  const mayRename = mayDelete;
  const startRenaming = (plan: PlanSummary) => {
    rename.reset();
    setRenamed(null);
    setConfirming(null);
    setRenaming(plan.id);
  };
  const renamingPlan = plans.data.find((plan) => plan.id === renaming) ?? null;
  const columns: DataTableColumn<PlanSummary>[] = [
    {
      id: "name",
      header: "Scenario",
      value: (plan) => plan.name,
      cell: (plan) => (
        <span>
          <span className="font-medium">{plan.name}</span>
          {!plan.runIsCurrent ? <span className="ml-2 rounded-sm bg-caution-100 px-1.5 py-0.5 text-caption text-caution-700">older fit</span> : null}
        </span>
      ),
    },
    { id: "markets", header: "Markets", value: (plan) => plan.markets.map((m) => m.name).join(", ") },
    { id: "cells", header: "Cells", value: (plan) => plan.cellCount, align: "end" },
    { id: "horizon", header: "Weeks", value: (plan) => plan.horizon, align: "end" },
    { id: "spend", header: "Planned spend", value: (plan) => Math.round(plan.spend), cell: (plan) => formatMoney(plan.spend, currency), align: "end" },
    {
      id: "extra",
      header: "Extra customers (median, 90 %)",
      value: (plan) => Number(plan.extraCustomers.q50.toPrecision(4)),
      cell: (plan) => `${formatNumber(plan.extraCustomers.q50, 3)} (${formatNumber(plan.extraCustomers.q05, 3)} to ${formatNumber(plan.extraCustomers.q95, 3)})`,
      align: "end",
    },
    { id: "status", header: "Status", value: (plan) => planStatusLabels[plan.status] },
    { id: "by", header: "Saved by", value: (plan) => plan.createdBy?.name ?? null },
    { id: "updated", header: "Saved", value: (plan) => plan.updatedAt, cell: (plan) => formatDateTime(plan.updatedAt) },
    {
      id: "actions",
      header: "Actions",
      value: () => null,
      sortable: false,
      cell: (plan) =>
        confirming === plan.id ? (
          <span className="inline-flex items-center gap-1">
            <span className="text-caption text-ink-700">Delete?</span>
            <Button variant="secondary" className="px-2! py-1!" onClick={() => remove.mutate(plan.id, { onSettled: () => setConfirming(null) })} disabled={remove.isPending}>
              Yes, delete
            </Button>
            <Button variant="quiet" className="px-2! py-1!" onClick={() => setConfirming(null)}>
              Keep
            </Button>
          </span>
        ) : (
          <span className="inline-flex flex-wrap items-center gap-1">
            <Button variant="secondary" className="px-2! py-1!" onClick={() => onOpen(plan)} disabled={opening !== null} aria-label={`Open ${plan.name}`}>
              {opening === plan.id ? "Opening…" : "Open"}
            </Button>
            {mayRename(plan) ? (
              <Button variant="quiet" className="px-2! py-1!" onClick={() => startRenaming(plan)} aria-label={`Rename ${plan.name}`}>
                Rename
              </Button>
            ) : null}
            {mayDelete(plan) ? (
              <Button variant="quiet" className="px-2! py-1!" onClick={() => setConfirming(plan.id)} aria-label={`Delete ${plan.name}`}>
                Delete
              </Button>
            ) : null}
          </span>
        ),
    },
  ];
  return (
    <div className="space-y-2">
      <DataTable
        caption="Saved scenarios"
        rows={plans.data}
        columns={columns}
        rowKey={(plan) => plan.id}
        csvFileName="saved-scenarios.csv"
        emptyMessage="No saved scenarios yet. Build one above and save it."
        initialSort={{ id: "updated", desc: true }}
        pageSize={10}
        compact
      />
      {renamingPlan ? (
        <RenameForm
          // A fresh form for each plan.
          key={renamingPlan.id}
          currentName={renamingPlan.name}
          label={`New name for “${renamingPlan.name}”`}
          maxLength={planBounds.name.max}
          check={checkPlanName}
          saving={rename.isPending}
          error={rename.isError ? (rename.error instanceof ApiError ? (rename.error.issues[0]?.message ?? rename.error.message) : "Renaming failed. Please try again.") : null}
          onSave={(name) =>
            rename.mutate(
              { planId: renamingPlan.id, name },
              {
                onSuccess: (saved) => {
                  setRenaming(null);
                  setRenamed({ from: renamingPlan.name, to: saved.name });
                },
              },
            )
          }
          onCancel={() => setRenaming(null)}
        />
      ) : null}
      {renamed ? (
        <p role="status" className="text-small font-medium text-ok-700">
          Renamed “{renamed.from}” to “{renamed.to}”.
        </p>
      ) : null}
      {remove.isError ? (
        <p role="alert" className="text-small font-medium text-alert-700">
          {remove.error instanceof ApiError ? remove.error.message : "Deleting failed. Please try again."}
        </p>
      ) : null}
      <p className="text-caption text-ink-600">
        Extra customers are against the recent-average plan, computed when the scenario was saved. A scenario saved on an older fit opens on the current one.
      </p>
    </div>
  );
}
