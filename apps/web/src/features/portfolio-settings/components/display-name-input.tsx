import type { UseFormRegisterReturn } from "react-hook-form";
import { inputClass } from "../../../components/ui/field";

/** A table cell's display-name input with its hidden label (named by the code) and its error below. */
export function DisplayNameInput({
  inputId,
  code,
  maxLength,
  widthClass,
  error,
  registration,
}: {
  inputId: string;
  code: string;
  /** The longest name allowed; the input takes a little more so the schema, not the input, explains the limit. */
  maxLength: number;
  widthClass: string;
  error: string | undefined;
  registration: UseFormRegisterReturn;
}) {
  return (
    <>
      <label htmlFor={inputId} className="sr-only">
        Display name of {code}
      </label>
      <input
        id={inputId}
        type="text"
        autoComplete="off"
        maxLength={maxLength + 20}
        className={`${inputClass} ${widthClass}`}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${inputId}-error` : undefined}
        {...registration}
      />
      {error ? (
        <p id={`${inputId}-error`} className="mt-1 max-w-md text-caption font-medium text-alert-700">
          {error}
        </p>
      ) : null}
    </>
  );
}
