import { zodResolver } from "@hookform/resolvers/zod";
import { currencyCodes, type PortfolioSettings } from "@tributary/contracts";
import { useEffect, useMemo, useState } from "react";
import { Controller, useForm } from "react-hook-form";
import type { z } from "zod";
import { describedBy, inputClass } from "../../../components/ui/field";
import { ApiError } from "../../../lib/api-client";
import { companySettingsInput, useUpdateCompanySettings } from "../api/update-company-settings";
import { FormActions, SaveFeedback } from "./save-feedback";

type CompanyForm = z.input<typeof companySettingsInput>;

/** "EUR — Euro"; a code the browser cannot name is shown alone. */
export function currencyLabel(code: string, names: Intl.DisplayNames | null): string {
  const name = names?.of(code);
  return name && name !== code ? `${code} — ${name}` : code;
}

function displayNames(): Intl.DisplayNames | null {
  try {
    return new Intl.DisplayNames(["en"], { type: "currency" });
  } catch {
    return null;
  }
}

/** The company name and the reporting currency (a new currency relabels figures; nothing is converted). */
export function CompanyForm({ settings }: { settings: PortfolioSettings }) {
  const saved = { companyName: settings.company, currency: settings.currency };
  const form = useForm<CompanyForm, unknown, z.output<typeof companySettingsInput>>({ resolver: zodResolver(companySettingsInput), defaultValues: saved });
  const update = useUpdateCompanySettings();
  const [done, setDone] = useState<string | null>(null);
  const { errors, isDirty } = form.formState;
  const chosenCurrency = form.watch("currency");
  const currencyChanged = chosenCurrency !== undefined && chosenCurrency !== settings.currency;
  const options = useMemo(() => {
    const names = displayNames();
    const codes = currencyCodes().includes(settings.currency) ? currencyCodes() : [settings.currency, ...currencyCodes()];
    return codes.map((code) => ({ code, label: currencyLabel(code, names) }));
  }, [settings.currency]);

  // A new edit makes the last "Saved" message stale.
  useEffect(() => {
    if (isDirty) setDone(null);
  }, [isDirty]);

  const submit = form.handleSubmit((values) => {
    setDone(null);
    update.mutate(values, {
      onSuccess: (next) => {
        form.reset({ companyName: next.company, currency: next.currency });
        setDone(next.currency !== settings.currency ? `Saved. Money is now labelled ${next.currency}; no figure was converted.` : "Saved.");
      },
      onError: (error) => {
        if (!(error instanceof ApiError)) return;
        for (const issue of error.issues) if (issue.path === "companyName" || issue.path === "currency") form.setError(issue.path, { type: "server", message: issue.message });
      },
    });
  });

  return (
    <form onSubmit={submit} noValidate aria-labelledby="company-title" className="space-y-4 rounded-lg border border-line bg-surface p-5 shadow-card">
      <div>
        <h2 id="company-title" className="text-heading font-semibold text-ink-900">
          Company
        </h2>
        <p className="text-small text-ink-700">The name on reports and e-mails, and the currency every money figure is labelled in.</p>
      </div>
      <div className="flex flex-wrap items-start gap-6">
        <div>
          <label htmlFor="company-name" className="block text-small font-medium text-ink-800">
            Company name
          </label>
          <input
            id="company-name"
            type="text"
            autoComplete="organization"
            className={`${inputClass} mt-1 w-80`}
            aria-invalid={errors.companyName ? true : undefined}
            aria-describedby={describedBy("company-name", { error: errors.companyName })}
            {...form.register("companyName")}
          />
          {errors.companyName ? (
            <p id="company-name-error" className="mt-1 text-caption font-medium text-alert-700">
              {errors.companyName.message}
            </p>
          ) : null}
        </div>
        <div>
          <label htmlFor="company-currency" className="block text-small font-medium text-ink-800">
            Reporting currency
          </label>
          <Controller
            control={form.control}
            name="currency"
            render={({ field }) => (
              <select
                id="company-currency"
                className={`${inputClass} mt-1 w-80`}
                aria-invalid={errors.currency ? true : undefined}
                aria-describedby={["company-currency-note", errors.currency ? "company-currency-error" : null].filter(Boolean).join(" ")}
                name={field.name}
                ref={field.ref}
                value={field.value ?? ""}
                onBlur={field.onBlur}
                onChange={(event) => field.onChange(event.target.value)}
              >
                {options.map((option) => (
                  <option key={option.code} value={option.code}>
                    {option.label}
                  </option>
                ))}
              </select>
            )}
          />
          {errors.currency ? (
            <p id="company-currency-error" className="mt-1 text-caption font-medium text-alert-700">
              {errors.currency.message}
            </p>
          ) : null}
        </div>
      </div>
      <p
        id="company-currency-note"
        className={`max-w-3xl rounded-md border px-3 py-2 text-small ${currencyChanged ? "border-caution-700/40 bg-caution-100 text-caution-700" : "border-line bg-paper text-ink-700"}`}
      >
        <strong className="font-semibold">Changing the currency only changes the label.</strong> No number is converted: spend in the uploaded data, fitted
        costs per customer and customer values stay as they are and are shown with the new code.
        {currencyChanged ? ` Every figure now in ${settings.currency} will read as ${chosenCurrency}. Only do this to correct the label, or after uploading the data in ${chosenCurrency}.` : ""}
      </p>
      <FormActions
        saveLabel="Save company"
        pending={update.isPending}
        dirty={isDirty}
        onUndo={() => {
          form.reset(saved);
          setDone(null);
          update.reset();
        }}
      >
        <SaveFeedback
          error={update.error}
          done={done}
          fallback="The company settings could not be saved. Please try again."
          isFieldPath={(path) => path === "companyName" || path === "currency"}
        />
      </FormActions>
    </form>
  );
}
