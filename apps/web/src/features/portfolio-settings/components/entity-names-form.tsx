import { zodResolver } from "@hookform/resolvers/zod";
import { portfolioSettingsBounds, type PortfolioSettings } from "@tributary/contracts";
import { useEffect, useState } from "react";
import { useFieldArray, useForm } from "react-hook-form";
import { z } from "zod";
import { ApiError } from "../../../lib/api-client";
import { brandNamesInput, marketNamesInput, useUpdateBrandNames, useUpdateMarketNames } from "../api/update-entity-names";
import { DisplayNameInput } from "./display-name-input";
import { FormActions, SaveFeedback } from "./save-feedback";

type Kind = "brand" | "market";

// The contracts' checks of a list of names (each tidied, none empty or too long, no two alike), over every row of the form.
const formSchemas = {
  brand: z.object({ entries: brandNamesInput.shape.brands }),
  market: z.object({ entries: marketNamesInput.shape.markets }),
};
type NamesForm = z.input<(typeof formSchemas)["brand"]>;
type NamesValues = z.output<(typeof formSchemas)["brand"]>;

const words = {
  brand: { title: "Brand names", plural: "brands", max: portfolioSettingsBounds.brandName.max },
  market: { title: "Market names", plural: "markets", max: portfolioSettingsBounds.marketName.max },
} as const;

const entitiesOf = (settings: PortfolioSettings, kind: Kind) => (kind === "brand" ? settings.brands : settings.markets);
const valuesOf = (settings: PortfolioSettings, kind: Kind): NamesForm => ({ entries: entitiesOf(settings, kind).map((e) => ({ id: e.id, name: e.name })) });

/**
 * The display names of the brands (or markets): what every screen, export and e-mail shows.
 * Codes stay: data files and links name brands and markets by code.
 */
export function EntityNamesForm({ kind, settings }: { kind: Kind; settings: PortfolioSettings }) {
  const form = useForm<NamesForm, unknown, NamesValues>({ resolver: zodResolver(formSchemas[kind]), defaultValues: valuesOf(settings, kind) });
  const { fields } = useFieldArray({ control: form.control, name: "entries", keyName: "key" });
  const brandNames = useUpdateBrandNames();
  const marketNames = useUpdateMarketNames();
  const update = kind === "brand" ? brandNames : marketNames;
  const [done, setDone] = useState<string | null>(null);
  const { errors, isDirty } = form.formState;
  const entities = entitiesOf(settings, kind);
  const codeOf = new Map(entities.map((e) => [e.id, e.code] as const));
  const { title, plural, max } = words[kind];
  const titleId = `${kind}-names-title`;

  // A new edit makes the last "Saved" message stale.
  useEffect(() => {
    if (isDirty) setDone(null);
  }, [isDirty]);

  const submit = form.handleSubmit((values) => {
    setDone(null);
    const before = new Map(entities.map((e) => [e.id, e.name] as const));
    // Only the names changed here are sent, so a change made meanwhile by someone else to another one stays.
    const changed = values.entries.filter((entry) => before.get(entry.id) !== entry.name);
    if (changed.length === 0) {
      form.reset(valuesOf(settings, kind));
      setDone("Nothing changed.");
      return;
    }
    const onSuccess = (next: PortfolioSettings) => {
      form.reset(valuesOf(next, kind));
      setDone(`Saved: ${changed.map((entry) => `“${before.get(entry.id)}” is now “${entry.name}”`).join(", ")}. Every screen shows the new ${changed.length === 1 ? "name" : "names"}.`);
    };
    const onError = (error: Error) => {
      if (!(error instanceof ApiError)) return;
      for (const issue of error.issues) {
        const match = /^(?:brands|markets)\.(\d+)\.name$/.exec(issue.path);
        const sent = match ? changed[Number(match[1])] : undefined;
        const row = sent ? values.entries.findIndex((entry) => entry.id === sent.id) : -1;
        if (row >= 0) form.setError(`entries.${row}.name`, { type: "server", message: issue.message });
      }
    };
    if (kind === "brand") brandNames.mutate({ brands: changed }, { onSuccess, onError });
    else marketNames.mutate({ markets: changed }, { onSuccess, onError });
  });

  return (
    <form onSubmit={submit} noValidate aria-labelledby={titleId} className="space-y-4 rounded-lg border border-line bg-surface p-5 shadow-card">
      <div>
        <h2 id={titleId} className="text-heading font-semibold text-ink-900">
          {title}
        </h2>
        <p className="max-w-3xl text-small text-ink-700">
          The names every screen, export, report and e-mail shows, saved plans included. The code is how data files and links name the {kind}; it stays the
          same, so a data file may still use the old name. No two {plural} may share a name.
        </p>
      </div>
      {fields.length === 0 ? (
        <p className="text-small text-ink-700">No {plural} yet: they are created when data is saved in Data intake.</p>
      ) : (
        <table className="w-full max-w-3xl text-small">
          <caption className="sr-only">{title}</caption>
          <thead>
            <tr className="border-b border-line text-left text-caption uppercase tracking-wide text-ink-600">
              <th scope="col" className="py-2 pr-4 font-semibold">
                Display name
              </th>
              <th scope="col" className="py-2 font-semibold">
                Code
              </th>
            </tr>
          </thead>
          <tbody>
            {fields.map((field, k) => {
              const error = errors.entries?.[k]?.name;
              const inputId = `${kind}-name-${field.id}`;
              const code = codeOf.get(field.id) ?? "";
              return (
                <tr key={field.key} className="border-b border-line/70 align-middle">
                  <td className="py-2 pr-4">
                    <DisplayNameInput
                      inputId={inputId}
                      code={code}
                      maxLength={max}
                      widthClass="w-72"
                      error={error?.message}
                      registration={form.register(`entries.${k}.name`)}
                    />
                  </td>
                  <td className="py-2 font-mono text-caption text-ink-700">{code}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      )}
      <FormActions
        saveLabel={`Save ${kind} names`}
        pending={update.isPending}
        dirty={isDirty}
        onUndo={() => {
          form.reset(valuesOf(settings, kind));
          setDone(null);
          update.reset();
        }}
      >
        <SaveFeedback
          error={update.error}
          done={done}
          fallback={`The ${kind} names could not be saved. Please try again.`}
          isFieldPath={(path) => /^(?:brands|markets)\.\d+\.name$/.test(path)}
        />
      </FormActions>
    </form>
  );
}
