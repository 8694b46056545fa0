import { zodResolver } from "@hookform/resolvers/zod";
import type { ColumnMappingDraft, UploadCreated } from "@tributary/contracts";
import { useState } from "react";
import { useFieldArray, useForm } from "react-hook-form";
import { Button } from "../../../components/ui/button";
import { inputClass } from "../../../components/ui/field";
import {
  choicesFromDraft,
  columnRoleLabels,
  columnRoles,
  draftFromChoices,
  mappingFormSchema,
  proposedChannelName,
  singleRoles,
  type ColumnRole,
  type MappingForm,
  type SingleRole,
} from "../mapping/column-roles";

type ColumnMappingStepProps = {
  upload: UploadCreated;
  /** The mapping last sent for checking, so going back keeps the analyst's choices. */
  initial?: ColumnMappingDraft | null;
  onSubmit: (mapping: ColumnMappingDraft) => void;
  checking: boolean;
};

const SAMPLE_VALUES = 3;

export function ColumnMappingStep({ upload, initial, onSubmit, checking }: ColumnMappingStepProps) {
  const form = useForm<MappingForm>({
    resolver: zodResolver(mappingFormSchema),
    defaultValues: { columns: choicesFromDraft(upload.header, initial ?? upload.guess) },
  });
  const { fields } = useFieldArray({ control: form.control, name: "columns" });
  const [announcement, setAnnouncement] = useState("");
  const columns = form.watch("columns");
  const errors = form.formState.errors;
  const roleErrors = (errors as { roles?: Partial<Record<SingleRole | "channel", { message?: string }>> }).roles;
  const roleMessages = [...singleRoles, "channel" as const].map((role) => roleErrors?.[role]?.message).filter((m): m is string => Boolean(m));

  function chooseRole(index: number, role: ColumnRole) {
    const current = form.getValues("columns");
    const moved: string[] = [];
    if ((singleRoles as readonly string[]).includes(role)) {
      current.forEach((column, i) => {
        if (i !== index && column.role === role) {
          form.setValue(`columns.${i}.role`, "ignore");
          moved.push(column.header);
        }
      });
    }
    form.setValue(`columns.${index}.role`, role, { shouldValidate: form.formState.isSubmitted });
    if (role === "channel" && current[index]?.channel.trim() === "") {
      form.setValue(`columns.${index}.channel`, proposedChannelName(current[index]?.header ?? ""));
    }
    setAnnouncement(
      moved.length > 0
        ? `${current[index]?.header} is now the ${role}; ${moved.join(", ")} ${moved.length === 1 ? "is" : "are"} ignored instead.`
        : "",
    );
  }

  const submit = form.handleSubmit((values) => onSubmit(draftFromChoices(values.columns)));
  const notes = upload.guess.notes;

  return (
    <form onSubmit={submit} noValidate aria-label="Column mapping" className="space-y-4">
      <p className="text-small text-ink-700">
        {upload.header.length} columns, {upload.rowCount.toLocaleString("en-GB")} rows in <strong>{upload.fileName}</strong>. Each column
        has been given the role it most likely plays; check them and change any that are wrong.
      </p>
      {notes.length > 0 ? (
        <ul aria-label="Notes on the guess" className="list-disc space-y-1 pl-5 text-small text-caution-700">
          {notes.map((note, i) => (
            <li key={i}>{note.message}</li>
          ))}
        </ul>
      ) : null}
      {roleMessages.length > 0 ? (
        <div role="alert" className="rounded-md border border-alert-700/30 bg-alert-100 px-3 py-2 text-small text-alert-700">
          <p className="font-semibold">The mapping is not complete:</p>
          <ul className="list-disc pl-5">
            {roleMessages.map((message) => (
              <li key={message}>{message}</li>
            ))}
          </ul>
        </div>
      ) : null}
      <p aria-live="polite" className="sr-only">
        {announcement}
      </p>
      <div className="overflow-x-auto rounded-lg border border-line">
        <table className="w-full border-collapse text-small">
          <caption className="sr-only">Role of each column</caption>
          <thead>
            <tr className="border-b border-line bg-ink-50 text-left">
              <th scope="col" className="px-3 py-2 font-semibold text-ink-800">
                Column
              </th>
              <th scope="col" className="px-3 py-2 font-semibold text-ink-800">
                First values
              </th>
              <th scope="col" className="w-64 px-3 py-2 font-semibold text-ink-800">
                Role
              </th>
              <th scope="col" className="w-56 px-3 py-2 font-semibold text-ink-800">
                Channel name
              </th>
            </tr>
          </thead>
          <tbody>
            {fields.map((field, index) => {
              const role = columns[index]?.role ?? "ignore";
              const channelError = errors.columns?.[index]?.channel?.message;
              const samples = upload.previewRows.slice(0, SAMPLE_VALUES).map((row) => row[index] ?? "");
              return (
                <tr key={field.id} className={`border-b border-line last:border-b-0 ${role === "ignore" ? "text-ink-500" : ""}`}>
                  <th scope="row" className="px-3 py-2 text-left font-mono text-small font-medium text-ink-900">
                    {field.header}
                  </th>
                  <td className="max-w-56 truncate px-3 py-2 text-ink-700" title={samples.join(", ")}>
                    {samples.join(", ") || <span className="text-ink-500">–</span>}
                  </td>
                  <td className="px-3 py-2">
                    <select
                      aria-label={`Role of ${field.header}`}
                      className={`${inputClass} w-full`}
                      value={role}
                      onChange={(event) => chooseRole(index, event.target.value as ColumnRole)}
                    >
                      {columnRoles.map((option) => (
                        <option key={option} value={option}>
                          {columnRoleLabels[option]}
                        </option>
                      ))}
                    </select>
                  </td>
                  <td className="px-3 py-2">
                    {role === "channel" ? (
                      <>
                        <input
                          aria-label={`Channel name for ${field.header}`}
                          aria-invalid={channelError ? true : undefined}
                          aria-describedby={channelError ? `channel-error-${index}` : undefined}
                          className={`${inputClass} w-full`}
                          {...form.register(`columns.${index}.channel`)}
                        />
                        {channelError ? (
                          <p id={`channel-error-${index}`} className="mt-1 text-caption font-medium text-alert-700">
                            {channelError}
                          </p>
                        ) : null}
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
      </div>
      <p className="text-caption text-ink-600">
        Channel names are kept as lower-case letters, digits and underscores (“Paid Social” becomes paid_social). Controls are
        other weekly numbers that move the outcome (price, promotions, weather); ignored columns are not saved.
      </p>
      <div className="flex items-center gap-3">
        <Button type="submit" disabled={checking}>
          {checking ? "Checking…" : "Check the data"}
        </Button>
      </div>
    </form>
  );
}
