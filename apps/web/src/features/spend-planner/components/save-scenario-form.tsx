import { planBounds, type ScenarioPlanInput } from "@tributary/contracts";
import { useId, useState, type FormEvent } from "react";
import { Button } from "../../../components/ui/button";
import { describedBy, inputClass } from "../../../components/ui/field";
import { ApiError } from "../../../lib/api-client";
import { createScenarioPlanInput, useCreateScenarioPlan } from "../api/create-scenario-plan";

type SaveScenarioFormProps = {
  /** Everything but the name and note; null while the scenario cannot be saved. */
  input: Omit<ScenarioPlanInput, "name" | "note"> | null;
  defaultName: string;
  /** Edits to the current plan go into the saved scenario as its first changes. */
  hasCurrentEdits: boolean;
};

/** Saves one scenario under a name, for the people who can see its markets. */
export function SaveScenarioForm({ input, defaultName, hasCurrentEdits }: SaveScenarioFormProps) {
  const id = useId();
  // Follows the scenario's name until the person types another one here.
  const [typedName, setName] = useState<string | null>(null);
  const name = typedName ?? defaultName;
  const [note, setNote] = useState("");
  const [errors, setErrors] = useState<Record<string, string>>({});
  const save = useCreateScenarioPlan();

  const submit = (event: FormEvent) => {
    event.preventDefault();
    if (!input) return;
    const parsed = createScenarioPlanInput.safeParse({ ...input, name, note: note.trim() === "" ? undefined : note });
    if (!parsed.success) {
      setErrors(Object.fromEntries(parsed.error.issues.map((issue) => [String(issue.path[0] ?? "form"), issue.message])));
      return;
    }
    setErrors({});
    save.mutate(parsed.data, {
      onError: (error) => {
        if (error instanceof ApiError && error.issues.length > 0) setErrors(Object.fromEntries(error.issues.map((issue) => [issue.path.split(".")[0] ?? "form", issue.message])));
      },
    });
  };

  const otherErrors = Object.entries(errors).filter(([key]) => key !== "name" && key !== "note");
  return (
    <form onSubmit={submit} noValidate aria-label={`Save ${defaultName || "scenario"}`} className="mt-3 rounded-md border border-line bg-paper/50 p-3">
      <div className="flex flex-wrap items-end gap-3">
        <div>
          <label htmlFor={`${id}-name`} className="block text-small font-medium text-ink-800">
            Save as
          </label>
          <input
            id={`${id}-name`}
            maxLength={planBounds.name.max}
            className={`${inputClass} mt-1 w-96 max-w-full`}
            value={name}
            aria-invalid={errors.name ? true : undefined}
            aria-describedby={describedBy(`${id}-name`, { error: errors.name })}
            onChange={(event) => setName(event.target.value)}
          />
        </div>
        <div className="min-w-64 flex-1">
          <label htmlFor={`${id}-note`} className="block text-small font-medium text-ink-800">
            Note (optional)
          </label>
          <input
            id={`${id}-note`}
            maxLength={planBounds.note.max}
            className={`${inputClass} mt-1 w-full`}
            value={note}
            aria-invalid={errors.note ? true : undefined}
            onChange={(event) => setNote(event.target.value)}
          />
        </div>
        <Button type="submit" disabled={!input || save.isPending}>
          {save.isPending ? "Saving…" : "Save scenario"}
        </Button>
      </div>
      {errors.name ? (
        <p id={`${id}-name-error`} className="mt-1 text-caption font-medium text-alert-700">
          {errors.name}
        </p>
      ) : null}
      {errors.note ? <p className="mt-1 text-caption font-medium text-alert-700">{errors.note}</p> : null}
      {otherErrors.map(([key, message]) => (
        <p key={key} className="mt-1 text-caption font-medium text-alert-700">
          {message}
        </p>
      ))}
      {!input ? <p className="mt-1 text-caption text-ink-600">Fix the scenario's changes before saving it.</p> : null}
      {hasCurrentEdits ? (
        <p className="mt-1 text-caption text-ink-600">
          Your edits to the current plan are saved as this scenario's first changes; the saved numbers compare it with the recent-average plan.
        </p>
      ) : null}
      {save.isError && !(save.error instanceof ApiError && save.error.issues.length > 0) ? (
        <p role="alert" className="mt-2 text-small font-medium text-alert-700">
          {save.error instanceof ApiError ? save.error.message : "Saving failed. Please try again."}
        </p>
      ) : null}
      {save.isSuccess ? (
        <p role="status" className="mt-2 text-small font-medium text-ok-700">
          Saved as “{save.data.name}”. People who can see {save.data.markets.map((m) => m.name).join(", ")} can open it.
        </p>
      ) : null}
    </form>
  );
}
