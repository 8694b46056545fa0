import type { ReactNode } from "react";

type PageHeaderProps = { title: string; description?: ReactNode; actions?: ReactNode; eyebrow?: string };

export function PageHeader({ title, description, actions, eyebrow }: PageHeaderProps) {
  return (
    <header className="mb-8 flex flex-wrap items-end justify-between gap-4 border-b border-line pb-5">
      <div className="max-w-3xl">
        {eyebrow ? <p className="mb-1 text-caption font-semibold uppercase tracking-wider text-stream-700">{eyebrow}</p> : null}
        <h1 className="text-title font-semibold tracking-tight text-ink-950">{title}</h1>
        {description ? <div className="mt-2 text-lead text-ink-700">{description}</div> : null}
      </div>
      {actions ? <div className="flex items-center gap-2">{actions}</div> : null}
    </header>
  );
}
