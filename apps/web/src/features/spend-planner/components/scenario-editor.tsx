import { useId } from "react";
import { Button } from "../../../components/ui/button";
import { describedBy, inputClass } from "../../../components/ui/field";
import type { ChannelName } from "../../../lib/channel-names";
import {
  newOperation,
  operationKindLabels,
  toOperation,
  weekSpan,
  type OperationDraft,
  type OperationKind,
  type ScenarioDraft,
} from "../scenario/scenario-draft";

type Choices = { channels: readonly string[]; markets: readonly string[]; brands: readonly string[] };

type ScenarioEditorProps = {
  scenario: ScenarioDraft;
  horizon: number;
  choices: Choices;
  channelName: ChannelName;
  onChange: (scenario: ScenarioDraft) => void;
  onRemove?: () => void;
  /** A problem the forecast found with the scenario as a whole (e.g. spend below zero). */
  problem?: string | null;
};

const kinds = Object.keys(operationKindLabels) as OperationKind[];

function FieldError({ id, message }: { id: string; message: string | undefined }) {
  return message ? (
    <p id={id} className="mt-1 text-caption font-medium text-alert-700">
      {message}
    </p>
  ) : null;
}

function OperationRow({
  draft,
  index,
  scenarioName,
  horizon,
  choices,
  channelName,
  onChange,
  onRemove,
}: {
  draft: OperationDraft;
  index: number;
  scenarioName: string;
  horizon: number;
  choices: Choices;
  channelName: ChannelName;
  onChange: (draft: OperationDraft) => void;
  onRemove: () => void;
}) {
  const id = useId();
  const check = toOperation(draft, horizon);
  const errors = check.ok ? {} : check.errors;
  const label = `change ${index + 1} of ${scenarioName || "this scenario"}`;
  const span = weekSpan(draft, horizon);
  const set = (patch: Partial<OperationDraft>) => onChange({ ...draft, ...patch });
  const valueLabel = draft.kind === "scale" ? "Factor" : draft.kind === "add" ? "Amount per week" : "Weekly spend";
  const weekFields = span ? Array.from({ length: span.to - span.from + 1 }, (_, k) => span.from + k) : [];

  return (
    <li className="rounded-md border border-line bg-paper/40 p-3" aria-label={`Change ${index + 1}`}>
      <div className="flex flex-wrap items-start gap-3">
        <div>
          <label htmlFor={`${id}-kind`} className="block text-caption font-medium text-ink-700">
            Change
          </label>
          <select id={`${id}-kind`} aria-label={`Kind of ${label}`} className={`${inputClass} mt-1 w-44`} value={draft.kind} onChange={(e) => set({ kind: e.target.value as OperationKind })}>
            {kinds.map((kind) => (
              <option key={kind} value={kind}>
                {operationKindLabels[kind]}
              </option>
            ))}
          </select>
        </div>
        {draft.kind === "set" ? (
          <label className="flex items-center gap-2 self-end pb-2 text-small text-ink-800">
            <input type="checkbox" checked={draft.perWeek} onChange={(e) => set({ perWeek: e.target.checked })} aria-label={`One value per week, ${label}`} />
            One value per week
          </label>
        ) : null}
        {draft.kind !== "zero" && !(draft.kind === "set" && draft.perWeek) ? (
          <div>
            <label htmlFor={`${id}-value`} className="block text-caption font-medium text-ink-700">
              {valueLabel}
            </label>
            <input
              id={`${id}-value`}
              inputMode="decimal"
              aria-label={`${valueLabel}, ${label}`}
              aria-invalid={errors.value ? true : undefined}
              aria-describedby={describedBy(`${id}-value`, { error: errors.value })}
              className={`${inputClass} mt-1 w-24 text-right tabular-nums`}
              value={draft.value}
              onChange={(e) => set({ value: e.target.value })}
            />
          </div>
        ) : null}
        <div>
          <label htmlFor={`${id}-channel`} className="block text-caption font-medium text-ink-700">
            Channel
          </label>
          <select id={`${id}-channel`} aria-label={`Channel of ${label}`} className={`${inputClass} mt-1 w-36`} value={draft.channel} onChange={(e) => set({ channel: e.target.value })}>
            <option value="">Every channel</option>
            {choices.channels.map((channel) => (
              <option key={channel} value={channel}>
                {channelName(channel)}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor={`${id}-market`} className="block text-caption font-medium text-ink-700">
            Market
          </label>
          <select id={`${id}-market`} aria-label={`Market of ${label}`} className={`${inputClass} mt-1 w-36`} value={draft.market} onChange={(e) => set({ market: e.target.value })}>
            <option value="">Every market</option>
            {choices.markets.map((market) => (
              <option key={market} value={market}>
                {market}
              </option>
            ))}
          </select>
        </div>
        {choices.brands.length > 1 ? (
          <div>
            <label htmlFor={`${id}-brand`} className="block text-caption font-medium text-ink-700">
              Brand
            </label>
            <select id={`${id}-brand`} aria-label={`Brand of ${label}`} className={`${inputClass} mt-1 w-32`} value={draft.brand} onChange={(e) => set({ brand: e.target.value })}>
              <option value="">Every brand</option>
              {choices.brands.map((brand) => (
                <option key={brand} value={brand}>
                  {brand}
                </option>
              ))}
            </select>
          </div>
        ) : null}
        <div role="group" aria-labelledby={`${id}-weeks`}>
          <span id={`${id}-weeks`} className="block text-caption font-medium text-ink-700">
            Plan weeks
          </span>
          <span className="mt-1 flex items-center gap-1.5">
            <input
              aria-label={`First week, ${label}`}
              inputMode="numeric"
              aria-invalid={errors.fromWeek ? true : undefined}
              aria-describedby={describedBy(`${id}-from`, { error: errors.fromWeek })}
              className={`${inputClass} w-14 text-right tabular-nums`}
              value={draft.fromWeek}
              onChange={(e) => set({ fromWeek: e.target.value })}
            />
            <span className="text-small text-ink-600">to</span>
            <input
              aria-label={`Last week, ${label}`}
              inputMode="numeric"
              aria-invalid={errors.toWeek ? true : undefined}
              aria-describedby={describedBy(`${id}-to`, { error: errors.toWeek })}
              className={`${inputClass} w-14 text-right tabular-nums`}
              value={draft.toWeek}
              onChange={(e) => set({ toWeek: e.target.value })}
            />
          </span>
        </div>
        <Button variant="quiet" className="ml-auto self-end" onClick={onRemove} aria-label={`Remove ${label}`}>
          Remove
        </Button>
      </div>
      <FieldError id={`${id}-value-error`} message={errors.value} />
      <FieldError id={`${id}-from-error`} message={errors.fromWeek} />
      <FieldError id={`${id}-to-error`} message={errors.toWeek} />
      {draft.kind === "set" && draft.perWeek ? (
        weekFields.length === 0 ? (
          <p className="mt-2 text-caption text-ink-600">Choose valid plan weeks to enter one value per week.</p>
        ) : (
          <div className="mt-3 flex flex-wrap gap-2">
            {weekFields.map((week, k) => {
              const error = errors[`week-${k}`];
              return (
                <div key={week}>
                  <label htmlFor={`${id}-week-${week}`} className="block text-caption text-ink-600">
                    Week {week}
                  </label>
                  <input
                    id={`${id}-week-${week}`}
                    inputMode="decimal"
                    aria-label={`Spend in week ${week}, ${label}`}
                    aria-invalid={error ? true : undefined}
                    title={error}
                    className={`${inputClass} mt-0.5 w-24 text-right tabular-nums`}
                    value={draft.weeklyValues[k] ?? ""}
                    onChange={(e) => {
                      const weeklyValues = weekFields.map((_, j) => draft.weeklyValues[j] ?? "");
                      weeklyValues[k] = e.target.value;
                      set({ weeklyValues });
                    }}
                  />
                </div>
              );
            })}
            {Object.keys(errors).some((key) => key.startsWith("week-")) ? (
              <p className="w-full text-caption font-medium text-alert-700">Enter a spend of 0 or more for every week.</p>
            ) : null}
          </div>
        )
      ) : null}
    </li>
  );
}

/** One scenario: its name and the changes it makes to the current plan, in order. */
export function ScenarioEditor({ scenario, horizon, choices, channelName, onChange, onRemove, problem }: ScenarioEditorProps) {
  const nameId = useId();
  const update = (index: number, draft: OperationDraft) => onChange({ ...scenario, operations: scenario.operations.map((op, i) => (i === index ? draft : op)) });
  return (
    <section aria-label={`Scenario ${scenario.name || "without a name"}`} className="rounded-lg border border-line bg-surface p-4 shadow-card">
      <div className="flex flex-wrap items-end gap-3">
        <div>
          <label htmlFor={nameId} className="block text-small font-medium text-ink-800">
            Scenario name
          </label>
          <input
            id={nameId}
            maxLength={120}
            className={`${inputClass} mt-1 w-96 max-w-full`}
            value={scenario.name}
            aria-invalid={scenario.name.trim() === "" ? true : undefined}
            onChange={(e) => onChange({ ...scenario, name: e.target.value })}
          />
        </div>
        {onRemove ? (
          <Button variant="secondary" className="ml-auto" onClick={onRemove}>
            Remove scenario
          </Button>
        ) : null}
      </div>
      {scenario.name.trim() === "" ? <p className="mt-1 text-caption font-medium text-alert-700">Give the scenario a name</p> : null}
      <ol className="mt-3 space-y-2">
        {scenario.operations.map((draft, index) => (
          <OperationRow
            key={draft.id}
            draft={draft}
            index={index}
            scenarioName={scenario.name}
            horizon={horizon}
            choices={choices}
            channelName={channelName}
            onChange={(next) => update(index, next)}
            onRemove={() => onChange({ ...scenario, operations: scenario.operations.filter((_, i) => i !== index) })}
          />
        ))}
      </ol>
      {scenario.operations.length === 0 ? <p className="mt-2 text-small text-ink-700">No changes yet: add one to compare this scenario with the current plan.</p> : null}
      {problem ? (
        <p role="alert" className="mt-3 rounded-md bg-alert-100 px-3 py-2 text-small text-alert-700">
          {problem}
        </p>
      ) : null}
      <p className="mt-2 text-caption text-ink-600">Changes apply in order, each to every line it targets (a market change applies to each of that market's cells).</p>
      <Button variant="secondary" className="mt-3" onClick={() => onChange({ ...scenario, operations: [...scenario.operations, newOperation(horizon)] })}>
        Add a change
      </Button>
    </section>
  );
}
