import type { DecodedDrawSetCell } from "@tributary/contracts";
import { useId } from "react";
import { CellPicker } from "../../../components/cell-picker/cell-picker";
import { describedBy, inputClass } from "../../../components/ui/field";

type PlanSetupProps = {
  cells: readonly DecodedDrawSetCell[];
  selected: readonly string[];
  onSelect: (cellIds: string[]) => void;
  horizon: string;
  onHorizon: (text: string) => void;
  horizonError: string | null;
  recentWeeks: string;
  onRecentWeeks: (text: string) => void;
  recentWeeksError: string | null;
};

/** Which cells to plan, and for how many weeks. */
export function PlanSetup({ cells, selected, onSelect, horizon, onHorizon, horizonError, recentWeeks, onRecentWeeks, recentWeeksError }: PlanSetupProps) {
  const id = useId();
  return (
    <section aria-labelledby={`${id}-title`} className="rounded-lg border border-line bg-surface p-5 shadow-card">
      <h2 id={`${id}-title`} className="text-heading font-semibold text-ink-900">
        What to plan
      </h2>
      <div className="mt-4 grid gap-6 lg:grid-cols-[minmax(0,2fr)_minmax(0,1fr)]">
        <CellPicker cells={cells} selected={selected} onSelect={onSelect} />
        <div className="space-y-4">
          <div>
            <label htmlFor={`${id}-horizon`} className="block text-small font-medium text-ink-800">
              Weeks to plan
            </label>
            <input
              id={`${id}-horizon`}
              inputMode="numeric"
              className={`${inputClass} mt-1 w-24 text-right tabular-nums`}
              value={horizon}
              aria-invalid={horizonError ? true : undefined}
              aria-describedby={describedBy(`${id}-horizon`, { help: true, error: horizonError })}
              onChange={(event) => onHorizon(event.target.value)}
            />
            <p id={`${id}-horizon-help`} className="mt-1 text-caption text-ink-600">
              From the week after each cell's last data week; 13 weeks is a quarter.
            </p>
            {horizonError ? (
              <p id={`${id}-horizon-error`} className="mt-1 text-caption font-medium text-alert-700">
                {horizonError}
              </p>
            ) : null}
          </div>
          <div>
            <label htmlFor={`${id}-recent`} className="block text-small font-medium text-ink-800">
              Recent weeks averaged for the current plan
            </label>
            <input
              id={`${id}-recent`}
              inputMode="numeric"
              className={`${inputClass} mt-1 w-24 text-right tabular-nums`}
              value={recentWeeks}
              aria-invalid={recentWeeksError ? true : undefined}
              aria-describedby={describedBy(`${id}-recent`, { help: true, error: recentWeeksError })}
              onChange={(event) => onRecentWeeks(event.target.value)}
            />
            <p id={`${id}-recent-help`} className="mt-1 text-caption text-ink-600">
              The current plan keeps each channel's average weekly spend of these last data weeks.
            </p>
            {recentWeeksError ? (
              <p id={`${id}-recent-error`} className="mt-1 text-caption font-medium text-alert-700">
                {recentWeeksError}
              </p>
            ) : null}
          </div>
        </div>
      </div>
    </section>
  );
}
