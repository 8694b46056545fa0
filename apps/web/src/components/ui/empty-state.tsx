import type { ReactNode } from "react";

type EmptyStateProps = { title: string; children?: ReactNode; action?: ReactNode; compact?: boolean };

/** Says plainly that there is nothing here yet, and why. */
export function EmptyState({ title, children, action, compact = false }: EmptyStateProps) {
  return (
    <section
      aria-label={title}
      className={`hatch-empty rounded-lg border border-dashed border-line-strong bg-surface/60 px-6 text-center ${compact ? "py-5" : "py-10"}`}
    >
      <svg viewBox="0 0 48 24" className={`mx-auto h-6 w-12 text-ink-300 ${compact ? "hidden" : "mb-3"}`} aria-hidden="true">
        <path d="M2 12c8-8 14 8 22 0s14 8 22 0" fill="none" stroke="currentColor" strokeWidth="2.5" strokeLinecap="round" />
      </svg>
      <h2 className="text-heading font-semibold text-ink-900">{title}</h2>
      {children ? <div className="mx-auto mt-2 max-w-xl text-body text-ink-700">{children}</div> : null}
      {action ? <div className="mt-5 flex justify-center">{action}</div> : null}
    </section>
  );
}
