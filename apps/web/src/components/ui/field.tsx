import type { ReactNode } from "react";

/** Looks of a text field, select or text area; add a width (w-full, w-32, …) where it is used. */
export const inputClass =
  "block rounded-md border border-field bg-surface px-2.5 py-1.5 text-small text-ink-900 placeholder:text-ink-500 aria-[invalid=true]:border-alert-700 disabled:bg-ink-50 disabled:text-ink-500";

type FieldProps = {
  /** The id of the control inside; label, help and error are tied to it. */
  id: string;
  label: ReactNode;
  help?: ReactNode;
  error?: string;
  children: ReactNode;
  className?: string;
};

/** Ids of the help and error texts of a field, for the control's aria-describedby. */
export function describedBy(id: string, { help, error }: { help?: unknown; error?: unknown }): string | undefined {
  const ids = [help ? `${id}-help` : null, error ? `${id}-error` : null].filter(Boolean);
  return ids.length > 0 ? ids.join(" ") : undefined;
}

/** A label, the control, a line of help and the error, if any. */
export function Field({ id, label, help, error, children, className = "" }: FieldProps) {
  return (
    <div className={className}>
      <label htmlFor={id} className="block text-small font-medium text-ink-800">
        {label}
      </label>
      <div className="mt-1">{children}</div>
      {help ? (
        <p id={`${id}-help`} className="mt-1 text-caption text-ink-600">
          {help}
        </p>
      ) : null}
      {error ? (
        <p id={`${id}-error`} className="mt-1 text-caption font-medium text-alert-700">
          {error}
        </p>
      ) : null}
    </div>
  );
}
