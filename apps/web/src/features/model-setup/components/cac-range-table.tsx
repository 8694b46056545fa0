import type { ModelSettingsInput } from "@tributary/contracts";
import type { PriorCheckResult } from "@tributary/stats";
import type { FieldErrors, UseFormRegister } from "react-hook-form";
import { inputClass } from "../../../components/ui/field";
import { formatMoney } from "../../../lib/format";

type CacRangeTableProps = {
  channels: string[];
  register: UseFormRegister<ModelSettingsInput>;
  errors: FieldErrors<ModelSettingsInput>;
  currency: string;
  prior: PriorCheckResult | null;
  stale: boolean;
};

/** Per channel: the lowest and highest plausible cost per new customer, beside what the priors then imply for a cell. */
export function CacRangeTable({ channels, register, errors, currency, prior, stale }: CacRangeTableProps) {
  const rangeErrors = errors.cacRanges;
  const listError = rangeErrors && "message" in rangeErrors ? (rangeErrors.message as string | undefined) : undefined;
  return (
    <div className="overflow-x-auto rounded-lg border border-line">
      <table className="w-full border-collapse text-small">
        <caption className="sr-only">Plausible cost per new customer at low spend, per channel</caption>
        <thead>
          <tr className="border-b border-line bg-ink-50 text-left">
            <th scope="col" className="px-3 py-2 font-semibold text-ink-800">
              Channel
            </th>
            <th scope="col" className="px-3 py-2 font-semibold text-ink-800">
              Lowest plausible ({currency})
            </th>
            <th scope="col" className="px-3 py-2 font-semibold text-ink-800">
              Highest plausible ({currency})
            </th>
            <th scope="col" className="px-3 py-2 font-semibold text-ink-800">
              Priors then allow per cell (90 %)
            </th>
          </tr>
        </thead>
        <tbody>
          {channels.map((channel, index) => {
            const loError = rangeErrors?.[index]?.lo?.message;
            const hiError = rangeErrors?.[index]?.hi?.message;
            const implied = prior?.channels.find((entry) => entry.channel === channel);
            return (
              <tr key={channel} className="border-b border-line last:border-b-0 align-top">
                <th scope="row" className="px-3 pb-2 pt-3.5 text-left font-medium text-ink-900">
                  {channel}
                  <input type="hidden" {...register(`cacRanges.${index}.channel`)} />
                </th>
                <td className="px-3 py-2">
                  <input
                    type="number"
                    inputMode="decimal"
                    step="any"
                    min={0}
                    aria-label={`Lowest plausible cost per customer, ${channel}`}
                    aria-invalid={loError ? true : undefined}
                    aria-describedby={loError ? `cac-lo-error-${index}` : undefined}
                    className={`${inputClass} w-32`}
                    {...register(`cacRanges.${index}.lo`, { valueAsNumber: true })}
                  />
                  {loError ? (
                    <p id={`cac-lo-error-${index}`} className="mt-1 max-w-48 text-caption font-medium text-alert-700">
                      {loError}
                    </p>
                  ) : null}
                </td>
                <td className="px-3 py-2">
                  <input
                    type="number"
                    inputMode="decimal"
                    step="any"
                    min={0}
                    aria-label={`Highest plausible cost per customer, ${channel}`}
                    aria-invalid={hiError ? true : undefined}
                    aria-describedby={hiError ? `cac-hi-error-${index}` : undefined}
                    className={`${inputClass} w-32`}
                    {...register(`cacRanges.${index}.hi`, { valueAsNumber: true })}
                  />
                  {hiError ? (
                    <p id={`cac-hi-error-${index}`} className="mt-1 max-w-48 text-caption font-medium text-alert-700">
                      {hiError}
                    </p>
                  ) : null}
                </td>
                <td className={`px-3 pb-2 pt-3.5 tabular-nums text-ink-800 ${stale ? "opacity-60" : ""}`} data-channel-prior={channel}>
                  {implied ? (
                    <>
                      {formatMoney(implied.cac0.q05, currency)} – {formatMoney(implied.cac0.q95, currency)}
                      <span className="text-ink-600"> · median {formatMoney(implied.cac0.q50, currency)}</span>
                    </>
                  ) : (
                    <span className="text-ink-500">–</span>
                  )}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      {listError ? <p className="px-3 py-2 text-caption font-medium text-alert-700">{listError}</p> : null}
    </div>
  );
}
