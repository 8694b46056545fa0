import { zodResolver } from "@hookform/resolvers/zod";
import {
  DEFAULT_CAC_RANGE,
  likelihoodKinds,
  likelihoodLabels,
  modelSettingsBounds,
  modelSettingsSchema,
  poolingStructureLabels,
  poolingStructures,
  saturationFormLabels,
  saturationForms,
  type DatasetVersion,
  type ModelSettings,
  type ModelSettingsInput,
  type ModelSettingsRecord,
} from "@tributary/contracts";
import type { PriorCheckModelOptions } from "@tributary/stats";
import { useEffect, useMemo, useState, type ReactNode } from "react";
import { useForm, useWatch, type FieldPath } from "react-hook-form";
import { Button } from "../../../components/ui/button";
import { EmptyState } from "../../../components/ui/empty-state";
import { describedBy, Field, inputClass } from "../../../components/ui/field";
import { ErrorState } from "../../../components/ui/error-state";
import { LoadingState } from "../../../components/ui/loading-state";
import { PageHeader } from "../../../components/ui/page-header";
import { ApiError } from "../../../lib/api-client";
import { formatWeekRange } from "../../../lib/format";
import { useCreateModelSettings } from "../api/create-model-settings";
import { usePriorCheckData } from "../api/get-prior-check-data";
import type { PriorCheckRunner } from "../worker/prior-check-runner";
import { usePriorCheck } from "../worker/use-prior-check";
import { CacRangeTable } from "./cac-range-table";
import { PriorCheckPanel } from "./prior-check-panel";
import { settingsHelp } from "./settings-help";

/** Draws of the priors per check: enough for steady 5 % and 95 % bands, few enough to update as you type. */
export const PRIOR_CHECK_DRAWS = 200;
const PRIOR_CHECK_SEED = 20_250_101;

type ModelSetupProps = {
  datasets: DatasetVersion[];
  currency: string;
  /** Queues a run of the saved settings; the route decides where to go next. */
  onStartFit: (record: ModelSettingsRecord) => Promise<void>;
  /** Injected in tests; the app uses a Web Worker. */
  priorCheckRunner?: PriorCheckRunner;
};

function defaultsFor(datasetVersionId: string): ModelSettingsInput {
  const d = modelSettingsSchema.parse({ datasetVersionId });
  return { ...d, seed: undefined };
}

/** The prior check's model options from valid settings, for the channels the data has. */
export function priorCheckOptionsOf(settings: ModelSettings, channels: readonly string[]): PriorCheckModelOptions {
  const cacRange: Record<string, [number, number]> = {};
  for (const range of settings.cacRanges) if (channels.includes(range.channel)) cacRange[range.channel] = [range.lo, range.hi];
  return {
    maxLag: settings.maxLag,
    saturation: settings.saturation,
    likelihood: settings.likelihood,
    seasonalityOrder: settings.seasonalityOrder,
    pooling: settings.pooling,
    holdoutWeeks: settings.holdoutWeeks,
    cacRange,
  };
}

function Section({ title, description, children }: { title: string; description?: ReactNode; children: ReactNode }) {
  const id = `section-${title.toLowerCase().replace(/[^a-z]+/g, "-")}`;
  return (
    <section aria-labelledby={id} className="rounded-lg border border-line bg-surface p-5 shadow-card">
      <h2 id={id} className="text-heading font-semibold text-ink-900">
        {title}
      </h2>
      {description ? <p className="mt-1 max-w-3xl text-small text-ink-700">{description}</p> : null}
      <div className="mt-4">{children}</div>
    </section>
  );
}

const settingFields: FieldPath<ModelSettingsInput>[] = [
  "datasetVersionId",
  "maxLag",
  "saturation",
  "likelihood",
  "seasonalityOrder",
  "pooling",
  "holdoutWeeks",
  "chains",
  "warmup",
  "draws",
  "seed",
  "unpooledComparison",
  "cacRanges",
];

export function ModelSetup({ datasets, currency, onStartFit, priorCheckRunner }: ModelSetupProps) {
  const latest = datasets.find((version) => version.latest) ?? datasets[0];
  if (!latest) {
    return (
      <>
        <ModelSetupHeader />
        <EmptyState title="No data to fit yet">
          Save a dataset version in Data intake first; the model setup starts from its channels and cells.
        </EmptyState>
      </>
    );
  }
  return <ModelSetupForm datasets={datasets} initialDatasetId={latest.id} currency={currency} onStartFit={onStartFit} priorCheckRunner={priorCheckRunner} />;
}

export function ModelSetupHeader() {
  return (
    <PageHeader
      title="Model setup"
      description="Say what the team already knows before any fit: the priors and the shape of the model. The prior check shows what they imply."
    />
  );
}

function ModelSetupForm({
  datasets,
  initialDatasetId,
  currency,
  onStartFit,
  priorCheckRunner,
}: Omit<ModelSetupProps, "datasets"> & { datasets: DatasetVersion[]; initialDatasetId: string }) {
  const form = useForm<ModelSettingsInput, unknown, ModelSettings>({
    resolver: zodResolver(modelSettingsSchema),
    defaultValues: defaultsFor(initialDatasetId),
    mode: "onChange",
  });
  const { errors } = form.formState;
  const values = useWatch({ control: form.control });
  const datasetId = values.datasetVersionId ?? null;
  const priorData = usePriorCheckData(datasetId);
  const channels = useMemo(() => priorData.data?.dataset.channels ?? [], [priorData.data]);
  const createSettings = useCreateModelSettings();
  const [startError, setStartError] = useState<string | null>(null);

  // One range row per channel of the chosen dataset, keeping what was typed for a channel of the same name.
  useEffect(() => {
    if (channels.length === 0) return;
    const current = form.getValues("cacRanges") ?? [];
    const next = channels.map((channel) => current.find((range) => range.channel === channel) ?? { channel, ...DEFAULT_CAC_RANGE });
    if (JSON.stringify(next) !== JSON.stringify(current)) form.setValue("cacRanges", next, { shouldValidate: true });
  }, [channels, form]);

  const parsed = modelSettingsSchema.safeParse(values);
  const rangesMatch = parsed.success && channels.every((channel) => parsed.data.cacRanges.some((range) => range.channel === channel));
  const options = parsed.success && rangesMatch && priorData.data ? priorCheckOptionsOf(parsed.data, channels) : null;
  const priorSettings = useMemo(() => ({ draws: PRIOR_CHECK_DRAWS, seed: PRIOR_CHECK_SEED }), []);
  const prior = usePriorCheck(priorData.data?.data ?? null, options, priorSettings, { runner: priorCheckRunner });

  const pausedBecause = priorData.isPending
    ? "Loading the dataset…"
    : priorData.isError
      ? null
      : !parsed.success
        ? "Paused: fix the highlighted settings to update the prior check."
        : null;

  const submit = form.handleSubmit(async (settings) => {
    setStartError(null);
    try {
      const record = await createSettings.mutateAsync(settings);
      await onStartFit(record);
    } catch (error) {
      if (error instanceof ApiError) {
        for (const issue of error.issues) {
          const path = issue.path as FieldPath<ModelSettingsInput>;
          if (settingFields.some((field) => path === field || path.startsWith(`${field}.`))) form.setError(path, { type: "server", message: issue.message });
        }
        setStartError(error.message);
      } else {
        setStartError(error instanceof Error ? error.message : "The fit could not be started.");
      }
    }
  });

  const chosen = datasets.find((version) => version.id === datasetId);
  const number = (name: "maxLag" | "seasonalityOrder" | "holdoutWeeks" | "chains" | "warmup" | "draws", label: string) => {
    const bounds = modelSettingsBounds[name];
    const id = `setting-${name}`;
    const error = errors[name]?.message;
    return (
      <Field id={id} label={label} help={settingsHelp[name]} error={error}>
        <input
          id={id}
          type="number"
          inputMode="numeric"
          min={bounds.min}
          max={bounds.max}
          step={1}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy(id, { help: true, error })}
          className={`${inputClass} w-32`}
          {...form.register(name, { valueAsNumber: true })}
        />
      </Field>
    );
  };
  const select = <K extends "saturation" | "likelihood" | "pooling">(name: K, label: string, options: readonly string[], labels: Record<string, string>) => {
    const id = `setting-${name}`;
    const error = errors[name]?.message;
    return (
      <Field id={id} label={label} help={settingsHelp[name]} error={error}>
        <select id={id} className={`${inputClass} w-full`} aria-describedby={describedBy(id, { help: true, error })} {...form.register(name)}>
          {options.map((option) => (
            <option key={option} value={option}>
              {labels[option]}
            </option>
          ))}
        </select>
      </Field>
    );
  };

  return (
    <>
      <ModelSetupHeader />
      <form onSubmit={submit} noValidate aria-label="Model settings" className="space-y-6">
        <Section title="Data">
          <Field id="setting-datasetVersionId" label="Dataset version" help={settingsHelp.datasetVersionId} error={errors.datasetVersionId?.message} className="max-w-xl">
            <select id="setting-datasetVersionId" className={`${inputClass} w-full`} aria-describedby={describedBy("setting-datasetVersionId", { help: true })} {...form.register("datasetVersionId")}>
              {datasets.map((version) => (
                <option key={version.id} value={version.id}>
                  Version {version.number}
                  {version.latest ? " (latest)" : ""} · {version.fileName} · {version.cellCount} cells
                </option>
              ))}
            </select>
          </Field>
          {chosen ? (
            <p className="mt-2 text-small text-ink-700">
              {chosen.channels.length} channels ({chosen.channels.join(", ")}), {chosen.cellCount} cells, {formatWeekRange(chosen.firstWeek, chosen.lastWeek) ?? "no weeks"}.
            </p>
          ) : null}
        </Section>

        <Section title="What you know about each channel" description={settingsHelp.cacRanges}>
          {priorData.isPending ? (
            <LoadingState label="Loading the dataset's channels…" />
          ) : priorData.isError ? (
            <ErrorState title="The dataset could not be loaded" message={priorData.error.message} onRetry={() => void priorData.refetch()} />
          ) : (
            <CacRangeTable channels={channels} register={form.register} errors={errors} currency={currency} prior={prior.result} stale={prior.stale || prior.status === "running"} />
          )}
        </Section>

        <Section title="Shape of the model">
          <div className="grid gap-x-6 gap-y-5 md:grid-cols-2 xl:grid-cols-3">
            {number("maxLag", "Carry-over length (weeks)")}
            {select("saturation", "Saturation form", saturationForms, saturationFormLabels)}
            {select("likelihood", "Likelihood", likelihoodKinds, likelihoodLabels)}
            {number("seasonalityOrder", "Seasonality order")}
            {select("pooling", "Pooling structure", poolingStructures, poolingStructureLabels)}
            {number("holdoutWeeks", "Holdout weeks")}
          </div>
        </Section>

        <PriorCheckPanel state={prior} currency={currency} outcomeLabel={(chosen?.outcomeColumn ?? "outcome").replace(/_/g, " ")} pausedBecause={pausedBecause} />

        <Section title="Sampler" description="How long and how many times the sampler explores. Small settings run fast for a first look; publish only a run marked trustworthy.">
          <div className="grid gap-x-6 gap-y-5 md:grid-cols-2 xl:grid-cols-4">
            {number("chains", "Chains")}
            {number("warmup", "Warm-up iterations per chain")}
            {number("draws", "Draws per chain")}
            <Field id="setting-seed" label="Seed (optional)" help={settingsHelp.seed} error={errors.seed?.message}>
              <input
                id="setting-seed"
                type="number"
                inputMode="numeric"
                min={0}
                step={1}
                aria-invalid={errors.seed ? true : undefined}
                aria-describedby={describedBy("setting-seed", { help: true, error: errors.seed })}
                className={`${inputClass} w-40`}
                {...form.register("seed", { setValueAs: (value: unknown) => (value === "" || value === null || value === undefined ? undefined : Number(value)) })}
              />
            </Field>
          </div>
          <div className="mt-5 flex items-start gap-2">
            <input id="setting-unpooledComparison" type="checkbox" className="mt-1 h-4 w-4 accent-stream-700" aria-describedby="setting-unpooledComparison-help" {...form.register("unpooledComparison")} />
            <div>
              <label htmlFor="setting-unpooledComparison" className="text-small font-medium text-ink-800">
                Also fit each cell on its own (unpooled comparison)
              </label>
              <p id="setting-unpooledComparison-help" className="text-caption text-ink-600">
                {settingsHelp.unpooledComparison}
              </p>
            </div>
          </div>
        </Section>

        <div className="flex flex-wrap items-center gap-4 border-t border-line pt-5">
          <Button type="submit" className="px-5 py-2.5" disabled={form.formState.isSubmitting}>
            {form.formState.isSubmitting ? "Starting…" : "Start fit"}
          </Button>
          <p className="text-small text-ink-700">Saves these settings and queues a run; you can follow it on the Runs screen.</p>
        </div>
        {startError ? (
          <p role="alert" className="rounded-md bg-alert-100 px-3 py-2 text-small text-alert-700">
            {startError}
          </p>
        ) : null}
      </form>
    </>
  );
}
