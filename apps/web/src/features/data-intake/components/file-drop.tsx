import { useId, useRef, useState, type DragEvent } from "react";

type FileDropProps = {
  /** Accessible name of the file input, e.g. "CSV file of weekly data". */
  label: string;
  hint: string;
  onFile: (file: File) => void;
  disabled?: boolean;
  accept?: string;
};

/** A file input that also takes a file dropped on it. */
export function FileDrop({ label, hint, onFile, disabled = false, accept = ".csv,text/csv" }: FileDropProps) {
  const inputId = useId();
  const input = useRef<HTMLInputElement>(null);
  const [over, setOver] = useState(false);

  function take(files: FileList | null) {
    const file = files?.[0];
    if (file) onFile(file);
    // Lets the same file be chosen again after fixing it.
    if (input.current) input.current.value = "";
  }

  function onDrop(event: DragEvent<HTMLDivElement>) {
    event.preventDefault();
    setOver(false);
    if (!disabled) take(event.dataTransfer.files);
  }

  return (
    <div
      onDragOver={(event) => {
        event.preventDefault();
        if (!disabled) setOver(true);
      }}
      onDragLeave={() => setOver(false)}
      onDrop={onDrop}
      data-drop-zone=""
      className={`rounded-lg border-2 border-dashed px-6 py-8 text-center transition-colors focus-within:border-stream-600 focus-within:ring-2 focus-within:ring-focus ${
        over ? "border-stream-600 bg-stream-50" : "border-line-strong bg-surface"
      } ${disabled ? "opacity-60" : ""}`}
    >
      <svg viewBox="0 0 48 32" className="mx-auto mb-2 h-8 w-12 text-stream-600" aria-hidden="true">
        <path d="M24 4v18m-7-7 7 7 7-7" fill="none" stroke="currentColor" strokeWidth="2.5" strokeLinecap="round" strokeLinejoin="round" />
        <path d="M4 24c6-5 10 5 16 0s10 5 16 0 8 3 8 3" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" opacity=".55" />
      </svg>
      <p className="text-body text-ink-800">
        Drop a file here, or{" "}
        <label htmlFor={inputId} className="cursor-pointer font-semibold text-stream-700 underline underline-offset-2 hover:text-stream-800">
          choose one
        </label>
      </p>
      <p className="mt-1 text-caption text-ink-600">{hint}</p>
      <input
        ref={input}
        id={inputId}
        type="file"
        accept={accept}
        aria-label={label}
        disabled={disabled}
        className="sr-only"
        onChange={(event) => take(event.target.files)}
      />
    </div>
  );
}
