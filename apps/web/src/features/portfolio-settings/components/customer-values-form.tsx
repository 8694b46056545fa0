import { zodResolver } from "@hookform/resolvers/zod";
import type { PortfolioSettings } from "@tributary/contracts";
import { useEffect, useState } from "react";
import { useFieldArray, useForm } from "react-hook-form";
import type { z } from "zod";
import { inputClass } from "../../../components/ui/field";
import { ApiError } from "../../../lib/api-client";
import { formatMoney } from "../../../lib/format";
import { customerValuesInput, useUpdateCustomerValues } from "../api/update-customer-values";
import { FormActions, SaveFeedback } from "./save-feedback";

type ValuesForm = z.input<typeof customerValuesInput>;

/** The text typed as the form's value: empty is "not known" (null); anything else must read as a number. */
export function customerValueOf(text: unknown): number | null {
  if (typeof text === "number") return text;
  if (text === null || text === undefined) return null;
  const trimmed = String(text).trim();
  if (trimmed === "") return null;
  // A space as thousands separator is common; a comma is ambiguous, so it stays an error.
  return /^[+-]?[\d\s]*\.?\d*(e[+-]?\d+)?$/i.test(trimmed) ? Number(trimmed.replace(/\s/g, "")) : Number.NaN;
}

const valuesOf = (settings: PortfolioSettings): ValuesForm => ({ brands: settings.brands.map((brand) => ({ id: brand.id, customerValue: brand.customerValue })) });

/** What a new customer is worth to each brand, in the reporting currency; empty when not known. */
export function CustomerValuesForm({ settings }: { settings: PortfolioSettings }) {
  const form = useForm<ValuesForm, unknown, z.output<typeof customerValuesInput>>({ resolver: zodResolver(customerValuesInput), defaultValues: valuesOf(settings) });
  const { fields } = useFieldArray({ control: form.control, name: "brands", keyName: "key" });
  const update = useUpdateCustomerValues();
  const [done, setDone] = useState<string | null>(null);
  const { errors, isDirty } = form.formState;
  const currency = settings.currency;

  // A new edit makes the last "Saved" message stale.
  useEffect(() => {
    if (isDirty) setDone(null);
  }, [isDirty]);

  const submit = form.handleSubmit((values) => {
    setDone(null);
    const before = new Map(settings.brands.map((brand) => [brand.id, brand.customerValue] as const));
    // Only the values changed here are sent, so a change made meanwhile by someone else to another brand stays.
    const changed = values.brands.filter((brand) => before.get(brand.id) !== brand.customerValue);
    if (changed.length === 0) {
      setDone("Nothing changed.");
      return;
    }
    update.mutate(
      { brands: changed },
      {
        onSuccess: (next) => {
          form.reset(valuesOf(next));
          const names = changed.map((brand) => next.brands.find((b) => b.id === brand.id)?.name ?? brand.id);
          setDone(`Saved the customer value of ${names.join(", ")}. The dashboards' chance of profit now uses it.`);
        },
        onError: (error) => {
          if (!(error instanceof ApiError)) return;
          for (const issue of error.issues) {
            const match = /^brands\.(\d+)\.customerValue$/.exec(issue.path);
            const sent = match ? changed[Number(match[1])] : undefined;
            const row = sent ? values.brands.findIndex((brand) => brand.id === sent.id) : -1;
            if (row >= 0) form.setError(`brands.${row}.customerValue`, { type: "server", message: issue.message });
          }
        },
      },
    );
  });

  return (
    <form onSubmit={submit} noValidate aria-labelledby="values-title" className="space-y-4 rounded-lg border border-line bg-surface p-5 shadow-card">
      <div>
        <h2 id="values-title" className="text-heading font-semibold text-ink-900">
          Brands
        </h2>
        <p className="max-w-3xl text-small text-ink-700">
          The customer value is what one new customer is worth to the brand, in {currency}. It sets the chance of profit on the dashboards (the share of
          estimates whose cost per customer is below it) and the profit objective of the Budget split. Leave it empty when it is not known: the chance of
          profit then shows as unavailable.
        </p>
      </div>
      {fields.length === 0 ? (
        <p className="text-small text-ink-700">No brands yet: they are created when data is saved in Data intake.</p>
      ) : (
        <table className="w-full max-w-3xl text-small">
          <caption className="sr-only">Customer value per brand, in {currency}</caption>
          <thead>
            <tr className="border-b border-line text-left text-caption uppercase tracking-wide text-ink-600">
              <th scope="col" className="py-2 pr-4 font-semibold">
                Brand
              </th>
              <th scope="col" className="py-2 pr-4 font-semibold">
                Customer value ({currency})
              </th>
              <th scope="col" className="py-2 font-semibold">
                Saved
              </th>
            </tr>
          </thead>
          <tbody>
            {fields.map((field, k) => {
              const brand = settings.brands.find((b) => b.id === field.id);
              const error = errors.brands?.[k]?.customerValue;
              const inputId = `customer-value-${k}`;
              return (
                <tr key={field.key} className="border-b border-line/70 align-middle">
                  <th scope="row" className="py-2 pr-4 text-left font-medium text-ink-900">
                    <label htmlFor={inputId}>{brand?.name ?? field.id}</label>
                  </th>
                  <td className="py-2 pr-4">
                    <div className="flex items-center gap-2">
                      <input
                        id={inputId}
                        type="text"
                        inputMode="decimal"
                        autoComplete="off"
                        placeholder="not known"
                        className={`${inputClass} w-36 text-right tabular-nums`}
                        aria-invalid={error ? true : undefined}
                        aria-describedby={error ? `${inputId}-error` : undefined}
                        {...form.register(`brands.${k}.customerValue`, { setValueAs: customerValueOf })}
                      />
                      <span className="text-caption text-ink-600" aria-hidden="true">
                        {currency}
                      </span>
                    </div>
                    {error ? (
                      <p id={`${inputId}-error`} className="mt-1 max-w-xs text-caption font-medium text-alert-700">
                        {error.message}
                      </p>
                    ) : null}
                  </td>
                  <td className="py-2 tabular-nums text-ink-700">{brand?.customerValue == null ? "not known" : formatMoney(brand.customerValue, currency)}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      )}
      <FormActions
        saveLabel="Save customer values"
        pending={update.isPending}
        dirty={isDirty}
        onUndo={() => {
          form.reset(valuesOf(settings));
          setDone(null);
          update.reset();
        }}
      >
        <SaveFeedback
          error={update.error}
          done={done}
          fallback="The customer values could not be saved. Please try again."
          isFieldPath={(path) => /^brands\.\d+\.customerValue$/.test(path)}
        />
      </FormActions>
    </form>
  );
}
