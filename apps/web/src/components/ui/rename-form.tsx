import { useEffect, useId, useRef, useState, type FormEvent, type KeyboardEvent } from "react";
import { Button } from "./button";
import { inputClass } from "./field";

type RenameFormProps = {
  /** The name now; the field starts with it. */
  currentName: string;
  /** The field's label and the form's name, e.g. "New name for “Quiet radio”". */
  label: string;
  maxLength: number;
  /** The same check the server makes: the name as it will be stored, or why it cannot be used. */
  check: (name: string) => { name: string } | { problem: string };
  saving: boolean;
  /** The server's refusal, shown under the field. */
  error: string | null;
  onSave: (name: string) => void;
  onCancel: () => void;
};

/**
 * A one-field form to rename something: Save, or Cancel (Escape) to keep the name. Show it
 * beside a table rather than inside a cell: DataTable remounts its cells when its columns change.
 */
export function RenameForm({ currentName, label, maxLength, check, saving, error, onSave, onCancel }: RenameFormProps) {
  const id = useId();
  const [name, setName] = useState(currentName);
  const [problem, setProblem] = useState<string | null>(null);
  // The server's refusal belongs to the name sent; once the person edits it, it no longer applies.
  const [sent, setSent] = useState<string | null>(null);
  const shown = problem ?? (sent !== null && name === sent ? error : null);
  const field = useRef<HTMLInputElement>(null);
  // Focus goes where the person asked to rename.
  useEffect(() => field.current?.focus(), []);

  const submit = (event: FormEvent) => {
    event.preventDefault();
    const checked = check(name);
    if ("problem" in checked) {
      setProblem(checked.problem);
      return;
    }
    setProblem(null);
    if (checked.name === currentName) return onCancel();
    setSent(name);
    onSave(checked.name);
  };
  const onKeyDown = (event: KeyboardEvent) => {
    if (event.key === "Escape") {
      event.preventDefault();
      onCancel();
    }
  };

  return (
    <form onSubmit={submit} noValidate aria-label={label} className="rounded-md border border-line bg-paper/50 p-3">
      <label htmlFor={`${id}-name`} className="block text-small font-medium text-ink-800">
        {label}
      </label>
      <div className="mt-1 flex flex-wrap items-center gap-2">
        <input
          id={`${id}-name`}
          ref={field}
          maxLength={maxLength}
          className={`${inputClass} w-96 max-w-full`}
          value={name}
          disabled={saving}
          aria-invalid={shown ? true : undefined}
          aria-describedby={shown ? `${id}-error` : undefined}
          onChange={(event) => {
            setName(event.target.value);
            setProblem(null);
          }}
          onKeyDown={onKeyDown}
        />
        <Button type="submit" variant="secondary" disabled={saving}>
          {saving ? "Saving…" : "Save name"}
        </Button>
        <Button variant="quiet" onClick={onCancel} disabled={saving}>
          Cancel
        </Button>
      </div>
      {shown ? (
        <p id={`${id}-error`} role="alert" className="mt-1 text-caption font-medium text-alert-700">
          {shown}
        </p>
      ) : null}
    </form>
  );
}
