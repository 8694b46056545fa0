import type { ReactNode } from "react";
import { Button } from "../../../components/ui/button";
import { ApiError } from "../../../lib/api-client";

/**
 * A form's outcome: why the server refused (when its problems are all shown beside the
 * fields, a pointer to them) or what was saved.
 */
export function SaveFeedback({ error, done, fallback, isFieldPath }: { error: Error | null; done: string | null; fallback: string; isFieldPath: (path: string) => boolean }) {
  if (error) {
    const atFields = error instanceof ApiError && error.issues.length > 0 && error.issues.every((issue) => isFieldPath(issue.path));
    const message = atFields ? "check the fields marked above." : error instanceof ApiError ? error.message : fallback;
    return (
      <p role="alert" className="ml-2 text-small font-medium text-alert-700">
        Not saved: {message}
      </p>
    );
  }
  return (
    <p role="status" className="ml-2 text-small font-medium text-ok-700">
      {done ?? ""}
    </p>
  );
}

/** A settings form's Save and Undo buttons, with the save's outcome beside them. */
export function FormActions({ saveLabel, pending, dirty, onUndo, children }: { saveLabel: string; pending: boolean; dirty: boolean; onUndo: () => void; children: ReactNode }) {
  return (
    <div className="flex flex-wrap items-center gap-2">
      <Button type="submit" disabled={pending || !dirty}>
        {pending ? "Saving…" : saveLabel}
      </Button>
      <Button variant="secondary" disabled={pending || !dirty} onClick={onUndo}>
        Undo changes
      </Button>
      {children}
    </div>
  );
}
