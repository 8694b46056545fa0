import { zodResolver } from "@hookform/resolvers/zod";
import { FLAG_NOTE_MAX_LENGTH, flagKindLabels, flagKinds, type CreateFlagInput, type Flag } from "@tributary/contracts";
import { useEffect, useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { FlagGlyph } from "../../../components/estimate/flag-badge";
import { Button } from "../../../components/ui/button";
import { describedBy, Field, inputClass } from "../../../components/ui/field";
import { ApiError } from "../../../lib/api-client";
import { createFlagInput } from "../api/create-flag";

export type FlagTarget = { cellId: string; channel: string };

type FlagFormProps = {
  /** The cells that can be flagged, as "brand · market". */
  cells: { cellId: string; label: string }[];
  channels: { code: string; name: string }[];
  runId: string;
  /** A cell × channel chosen elsewhere on the screen (e.g. "Flag this" on an outlier). */
  target: FlagTarget | null;
  onSubmit: (input: CreateFlagInput) => Promise<Flag>;
};

type FormValues = z.input<typeof createFlagInput>;
const fieldNames = ["cellId", "channel", "kind", "note"] as const;

const kindHelp: Record<(typeof flagKinds)[number], string> = {
  data_problem: "the data behind it look wrong (a gap, a spike, a mislabelled week)",
  real_difference: "the cell truly differs from its peers; pooling should not hide it",
  needs_lift_test: "only a controlled experiment can settle it",
};

/** Flags one cell × channel estimate with a kind and a note. */
export function FlagForm({ cells, channels, runId, target, onSubmit }: FlagFormProps) {
  const [saved, setSaved] = useState<Flag | null>(null);
  const form = useForm<FormValues, unknown, CreateFlagInput>({
    resolver: zodResolver(createFlagInput),
    defaultValues: { cellId: target?.cellId ?? "", channel: target?.channel ?? "", note: "", runId },
  });
  const { errors, isSubmitting } = form.formState;

  // A cell × channel picked elsewhere fills the form in.
  useEffect(() => {
    if (!target) return;
    form.setValue("cellId", target.cellId);
    form.setValue("channel", target.channel);
    form.setFocus("note");
  }, [form, target]);

  const submit = form.handleSubmit(async (values) => {
    setSaved(null);
    try {
      const flag = await onSubmit(values);
      setSaved(flag);
      form.reset({ cellId: values.cellId, channel: values.channel, kind: undefined, note: "", runId });
    } catch (error) {
      const issues = error instanceof ApiError ? error.issues : [];
      for (const issue of issues) {
        const name = fieldNames.find((field) => issue.path === field || issue.path.endsWith(`.${field}`));
        if (name) form.setError(name, { type: "server", message: issue.message });
      }
      form.setError("root", { type: "server", message: error instanceof Error ? error.message : "The flag could not be saved." });
    }
  });

  const control = (name: (typeof fieldNames)[number], help = false) => ({
    id: `flag-${name}`,
    "aria-invalid": errors[name] ? true : undefined,
    "aria-describedby": describedBy(`flag-${name}`, { help, error: errors[name] }),
  });

  return (
    <form onSubmit={submit} noValidate aria-label="Flag an estimate" className="space-y-4">
      {errors.root ? (
        <p role="alert" className="rounded-md bg-alert-100 px-3 py-2 text-small text-alert-700">
          {errors.root.message}
        </p>
      ) : null}
      {saved ? (
        <p role="status" className="rounded-md bg-ok-100 px-3 py-2 text-small text-ok-700">
          Flagged {saved.brand} in {saved.market}, {saved.channelName}, as “{flagKindLabels[saved.kind].toLowerCase()}”. The badge now shows on every
          screen.
        </p>
      ) : null}
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id="flag-cellId" label="Cell" error={errors.cellId?.message}>
          <select className={`${inputClass} w-full`} {...control("cellId")} {...form.register("cellId")}>
            <option value="">Choose a cell</option>
            {cells.map((cell) => (
              <option key={cell.cellId} value={cell.cellId}>
                {cell.label}
              </option>
            ))}
          </select>
        </Field>
        <Field id="flag-channel" label="Channel" error={errors.channel?.message}>
          <select className={`${inputClass} w-full`} {...control("channel")} {...form.register("channel")}>
            <option value="">Choose a channel</option>
            {channels.map((channel) => (
              <option key={channel.code} value={channel.code}>
                {channel.name}
              </option>
            ))}
          </select>
        </Field>
      </div>
      <fieldset aria-describedby={errors.kind ? "flag-kind-error" : undefined}>
        <legend className="text-small font-medium text-ink-800">Kind of flag</legend>
        <div className="mt-1 space-y-1.5">
          {flagKinds.map((kind) => (
            <label key={kind} className="flex items-start gap-2 text-small text-ink-900">
              <input type="radio" value={kind} className="mt-1 accent-stream-700" {...form.register("kind")} />
              <span>
                <span className="inline-flex items-center gap-1.5 font-medium">
                  <FlagGlyph kind={kind} />
                  {flagKindLabels[kind]}
                </span>
                <span className="block text-caption text-ink-600">{kindHelp[kind]}</span>
              </span>
            </label>
          ))}
        </div>
        {errors.kind ? (
          <p id="flag-kind-error" className="mt-1 text-caption font-medium text-alert-700">
            {errors.kind.message}
          </p>
        ) : null}
      </fieldset>
      <Field id="flag-note" label="Note" error={errors.note?.message} help="Why you flag it, for the people who read the estimate.">
        <textarea rows={3} maxLength={FLAG_NOTE_MAX_LENGTH} className={`${inputClass} w-full`} {...control("note", true)} {...form.register("note")} />
      </Field>
      <Button type="submit" disabled={isSubmitting}>
        {isSubmitting ? "Saving…" : "Flag this estimate"}
      </Button>
    </form>
  );
}
