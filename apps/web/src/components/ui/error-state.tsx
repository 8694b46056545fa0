import type { ReactNode } from "react";
import { Button } from "./button";

type ErrorStateProps = { title?: string; message: string; onRetry?: () => void; children?: ReactNode };

export function ErrorState({ title = "Something went wrong", message, onRetry, children }: ErrorStateProps) {
  return (
    <div role="alert" className="rounded-lg border border-alert-700/30 bg-alert-100 px-5 py-4 text-ink-900">
      <h2 className="text-body font-semibold text-alert-700">{title}</h2>
      <p className="mt-1">{message}</p>
      {children}
      {onRetry ? (
        <Button variant="secondary" className="mt-3" onClick={onRetry}>
          Try again
        </Button>
      ) : null}
    </div>
  );
}
