import type { DecodedDrawSetCell } from "@tributary/contracts";
import { useId, type FormEvent } from "react";
import { CellPicker } from "../../../components/cell-picker/cell-picker";
import { Button } from "../../../components/ui/button";
import { describedBy, inputClass } from "../../../components/ui/field";
import type { ChannelName } from "../../../lib/channel-names";
import { formatMoney } from "../../../lib/format";
import type { BoundText, SplitFormState } from "../split/split-form";

type SplitFormPanelProps = {
  state: SplitFormState;
  onChange: (state: SplitFormState) => void;
  cells: readonly DecodedDrawSetCell[];
  channels: readonly string[];
  channelName: ChannelName;
  currency: string;
  /** Customer value per brand name (null: not set). */
  customerValues: Readonly<Record<string, number | null>>;
  /** Current spend of the chosen cells over the horizon, when the inputs allow computing it. */
  currentSpend: number | null;
  errors: Record<string, string>;
  /** Errors show once the person tried to split. */
  showErrors: boolean;
  onSubmit: () => void;
  busy: boolean;
};

function ErrorText({ id, message }: { id: string; message: string | undefined }) {
  return message ? (
    <p id={id} className="mt-1 text-caption font-medium text-alert-700">
      {message}
    </p>
  ) : null;
}

function BoundsTable({
  caption,
  rows,
  values,
  errorPrefix,
  errors,
  onChange,
}: {
  caption: string;
  rows: { key: string; label: string }[];
  values: Record<string, BoundText>;
  errorPrefix: string;
  errors: Record<string, string>;
  onChange: (key: string, bound: BoundText) => void;
}) {
  return (
    <table className="w-full text-small">
      <caption className="text-left text-small font-medium text-ink-800">{caption}</caption>
      <thead>
        <tr className="text-caption text-ink-600">
          <th scope="col" className="py-1 text-left font-medium">
            Line
          </th>
          <th scope="col" className="py-1 text-right font-medium">
            Lower
          </th>
          <th scope="col" className="py-1 text-right font-medium">
            Upper
          </th>
        </tr>
      </thead>
      <tbody>
        {rows.map((row) => {
          const bound = values[row.key] ?? { lower: "", upper: "" };
          const lowerError = errors[`${errorPrefix}${row.key}.lower`];
          const upperError = errors[`${errorPrefix}${row.key}.upper`];
          return (
            <tr key={row.key} className="border-t border-line">
              <th scope="row" className="py-1 pr-2 text-left font-normal text-ink-800">
                {row.label}
                {lowerError || upperError ? <span className="block text-caption font-medium text-alert-700">{lowerError ?? upperError}</span> : null}
              </th>
              <td className="py-1 text-right">
                <input
                  inputMode="decimal"
                  aria-label={`Lower bound, ${row.label}`}
                  aria-invalid={lowerError ? true : undefined}
                  placeholder="none"
                  className={`${inputClass} ml-auto w-28 text-right tabular-nums`}
                  value={bound.lower}
                  onChange={(event) => onChange(row.key, { ...bound, lower: event.target.value })}
                />
              </td>
              <td className="py-1 pl-2 text-right">
                <input
                  inputMode="decimal"
                  aria-label={`Upper bound, ${row.label}`}
                  aria-invalid={upperError ? true : undefined}
                  placeholder="none"
                  className={`${inputClass} ml-auto w-28 text-right tabular-nums`}
                  value={bound.upper}
                  onChange={(event) => onChange(row.key, { ...bound, upper: event.target.value })}
                />
              </td>
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}

/** The split's inputs: cells, budget and horizon, bounds, objective and risk attitude. */
export function SplitFormPanel({ state, onChange, cells, channels, channelName, currency, customerValues, currentSpend, errors: allErrors, showErrors, onSubmit, busy }: SplitFormPanelProps) {
  const id = useId();
  const errors = showErrors ? allErrors : {};
  const set = (patch: Partial<SplitFormState>) => onChange({ ...state, ...patch });
  const chosen = cells.filter((cell) => state.cellIds.includes(cell.cellId));
  const brands = [...new Set(chosen.map((cell) => cell.brand))];
  const submit = (event: FormEvent) => {
    event.preventDefault();
    onSubmit();
  };
  const field = (name: "totalBudget" | "horizon" | "recentWeeks", label: string, help: string, width = "w-36") => (
    <div>
      <label htmlFor={`${id}-${name}`} className="block text-small font-medium text-ink-800">
        {label}
      </label>
      <input
        id={`${id}-${name}`}
        inputMode="decimal"
        className={`${inputClass} mt-1 ${width} text-right tabular-nums`}
        value={state[name]}
        aria-invalid={errors[name] ? true : undefined}
        aria-describedby={describedBy(`${id}-${name}`, { help, error: errors[name] })}
        onChange={(event) => set({ [name]: event.target.value })}
      />
      <p id={`${id}-${name}-help`} className="mt-1 text-caption text-ink-600">
        {help}
      </p>
      <ErrorText id={`${id}-${name}-error`} message={errors[name]} />
    </div>
  );

  return (
    <form onSubmit={submit} noValidate aria-label="Budget split inputs" className="space-y-6 rounded-lg border border-line bg-surface p-5 shadow-card">
      <CellPicker cells={cells} selected={state.cellIds} onSelect={(cellIds) => set({ cellIds })} legend="Cells that share the budget" />
      <div className="grid gap-5 md:grid-cols-3">
        {field("totalBudget", `Total budget (${currency})`, currentSpend === null ? "Over the whole horizon." : `Over the whole horizon. At current spend: ${formatMoney(currentSpend, currency)}.`, "w-40")}
        {field("horizon", "Weeks", "The weeks the budget covers.", "w-24")}
        {field("recentWeeks", "Recent weeks for the current spend", "The current allocation averages these last data weeks.", "w-24")}
      </div>

      <div className="grid items-start gap-6 lg:grid-cols-2">
        <BoundsTable
          caption={`Bounds per channel, over the horizon (${currency})`}
          rows={channels.map((channel) => ({ key: channel, label: channelName(channel) }))}
          values={state.channelBounds}
          errorPrefix="channel:"
          errors={errors}
          onChange={(key, bound) => set({ channelBounds: { ...state.channelBounds, [key]: bound } })}
        />
        <BoundsTable
          caption={`Bounds per cell, over the horizon (${currency})`}
          rows={chosen.map((cell) => ({ key: cell.cellId, label: `${cell.brand} in ${cell.market}` }))}
          values={state.cellBounds}
          errorPrefix="cell:"
          errors={errors}
          onChange={(key, bound) => set({ cellBounds: { ...state.cellBounds, [key]: bound } })}
        />
      </div>
      <p className="-mt-3 text-caption text-ink-600">A bound applies to each line (cell × channel) it covers, not to their sum: a channel's upper bound caps that channel in every chosen cell.</p>

      <div className="grid gap-6 md:grid-cols-2">
        <fieldset>
          <legend className="text-small font-medium text-ink-800">Objective</legend>
          <label className="mt-2 flex items-start gap-2 text-small text-ink-800">
            <input type="radio" name={`${id}-objective`} checked={state.objective === "customers"} onChange={() => set({ objective: "customers" })} className="mt-1" />
            <span>
              Most expected new customers
              <span className="block text-caption text-ink-600">The whole budget is spent.</span>
            </span>
          </label>
          <label className="mt-2 flex items-start gap-2 text-small text-ink-800">
            <input type="radio" name={`${id}-objective`} checked={state.objective === "profit"} onChange={() => set({ objective: "profit" })} className="mt-1" />
            <span>
              Most expected profit
              <span className="block text-caption text-ink-600">
                Customer value × new customers − spend; the budget is an upper limit.{" "}
                {brands.length > 0
                  ? `Values: ${brands.map((brand) => `${brand} ${customerValues[brand] == null ? "not set" : formatMoney(customerValues[brand]!, currency)}`).join(", ")}.`
                  : ""}
              </span>
            </span>
          </label>
          <ErrorText id={`${id}-objective-error`} message={errors.objective} />
        </fieldset>
        <fieldset>
          <legend className="text-small font-medium text-ink-800">Attitude to risk</legend>
          <label className="mt-2 flex items-start gap-2 text-small text-ink-800">
            <input type="radio" name={`${id}-risk`} checked={state.risk === "expected"} onChange={() => set({ risk: "expected" })} className="mt-1" />
            <span>
              Expected value
              <span className="block text-caption text-ink-600">Best on average over the posterior draws.</span>
            </span>
          </label>
          <label className="mt-2 flex items-start gap-2 text-small text-ink-800">
            <input type="radio" name={`${id}-risk`} checked={state.risk === "lower-quantile"} onChange={() => set({ risk: "lower-quantile" })} className="mt-1" />
            <span>
              Best outcome in a bad case
              <span className="block text-caption text-ink-600">Maximise a low quantile of the outcome: the level reached in most draws.</span>
            </span>
          </label>
          {state.risk === "lower-quantile" ? (
            <div className="ml-6 mt-1">
              <label htmlFor={`${id}-quantile`} className="text-caption text-ink-700">
                Quantile (%)
              </label>
              <input
                id={`${id}-quantile`}
                inputMode="decimal"
                className={`${inputClass} ml-2 inline-block w-20 text-right`}
                value={state.quantilePercent}
                aria-invalid={errors.quantilePercent ? true : undefined}
                aria-describedby={describedBy(`${id}-quantile`, { error: errors.quantilePercent })}
                onChange={(event) => set({ quantilePercent: event.target.value })}
              />
              <ErrorText id={`${id}-quantile-error`} message={errors.quantilePercent} />
            </div>
          ) : null}
          <label className="mt-2 flex items-start gap-2 text-small text-ink-800">
            <input type="radio" name={`${id}-risk`} checked={state.risk === "mean-minus-sd"} onChange={() => set({ risk: "mean-minus-sd" })} className="mt-1" />
            <span>
              Expected value with a penalty on spread
              <span className="block text-caption text-ink-600">Maximise mean − penalty × standard deviation of the outcome.</span>
            </span>
          </label>
          {state.risk === "mean-minus-sd" ? (
            <div className="ml-6 mt-1">
              <label htmlFor={`${id}-penalty`} className="text-caption text-ink-700">
                Penalty
              </label>
              <input
                id={`${id}-penalty`}
                inputMode="decimal"
                className={`${inputClass} ml-2 inline-block w-20 text-right`}
                value={state.penalty}
                aria-invalid={errors.penalty ? true : undefined}
                aria-describedby={describedBy(`${id}-penalty`, { error: errors.penalty })}
                onChange={(event) => set({ penalty: event.target.value })}
              />
              <ErrorText id={`${id}-penalty-error`} message={errors.penalty} />
            </div>
          ) : null}
        </fieldset>
      </div>
      {showErrors && errors.cells ? <p className="text-small font-medium text-alert-700">{errors.cells}</p> : null}
      {showErrors && Object.keys(allErrors).length > 0 ? (
        <p role="alert" className="text-small font-medium text-alert-700">
          Some inputs need fixing before the budget can be split.
        </p>
      ) : null}
      <Button type="submit" disabled={busy}>
        {busy ? "Splitting…" : "Split the budget"}
      </Button>
    </form>
  );
}
