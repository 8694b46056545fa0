import type { AuditEntry, Person } from "@tributary/contracts";
import { useId, useState } from "react";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { Button } from "../../../components/ui/button";
import { ErrorState } from "../../../components/ui/error-state";
import { inputClass } from "../../../components/ui/field";
import { LoadingState } from "../../../components/ui/loading-state";
import { formatDateTime } from "../../../lib/format";
import { useAuditLog, type AuditLogFilter } from "../api/get-audit-log";

const PAGE_SIZE = 25;

/** "plan_created" as "plan created". */
export const actionLabel = (action: string) => action.replace(/_/g, " ");

/** The details of an entry as short "key: value" text. */
export function detailsText(details: unknown): string {
  if (details === null || details === undefined) return "";
  if (typeof details !== "object") return String(details);
  return Object.entries(details as Record<string, unknown>)
    .filter(([, value]) => value !== null && value !== undefined)
    .map(([key, value]) => `${key}: ${typeof value === "object" ? JSON.stringify(value) : String(value)}`)
    .join("; ");
}

/** "plan:6d54ff06-e2e3-…" as "plan 6d54ff06" (the whole target stays in the title and the export). */
export function targetText(target: string | null): string {
  if (!target) return "";
  const [kind, ...rest] = target.split(":");
  const id = rest.join(":");
  return id ? `${kind!.replace(/_/g, " ")} ${id.length > 12 ? id.slice(0, 8) : id}` : target;
}

const columns: DataTableColumn<AuditEntry>[] = [
  { id: "at", header: "When", value: (e) => e.at, cell: (e) => <span className="whitespace-nowrap">{formatDateTime(e.at)}</span> },
  { id: "who", header: "Who", value: (e) => e.user?.name ?? "system", cell: (e) => <span className="whitespace-nowrap">{e.user?.name ?? "system"}</span> },
  { id: "action", header: "Action", value: (e) => actionLabel(e.action), cell: (e) => <span className="whitespace-nowrap">{actionLabel(e.action)}</span> },
  { id: "target", header: "On", value: (e) => e.target, cell: (e) => <span className="whitespace-nowrap font-mono text-caption" title={e.target ?? undefined}>{targetText(e.target)}</span> },
  { id: "details", header: "Details", value: (e) => detailsText(e.details), cell: (e) => <span className="block max-w-md truncate" title={detailsText(e.details)}>{detailsText(e.details)}</span> },
];

/** The audit log, newest first, paged and filtered on the server. */
export function AuditLog({ people }: { people: readonly Person[] }) {
  const id = useId();
  const [filter, setFilter] = useState<AuditLogFilter>({ page: 1, pageSize: PAGE_SIZE });
  const log = useAuditLog(filter);
  if (log.isPending) return <LoadingState label="Loading the audit log…" />;
  if (log.isError) return <ErrorState title="The audit log could not be loaded" message={log.error.message} onRetry={() => void log.refetch()} />;
  const page = log.data;
  const pageCount = Math.max(1, Math.ceil(page.total / page.pageSize));
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-end gap-4" role="group" aria-label="Filter the audit log">
        <div>
          <label htmlFor={`${id}-action`} className="block text-small font-medium text-ink-800">
            Action
          </label>
          <select id={`${id}-action`} className={`${inputClass} mt-1 w-56`} value={filter.action ?? ""} onChange={(event) => setFilter((c) => ({ ...c, action: event.target.value || undefined, page: 1 }))}>
            <option value="">Every action</option>
            {page.actions.map((action) => (
              <option key={action} value={action}>
                {actionLabel(action)}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor={`${id}-user`} className="block text-small font-medium text-ink-800">
            Person
          </label>
          <select id={`${id}-user`} className={`${inputClass} mt-1 w-56`} value={filter.userId ?? ""} onChange={(event) => setFilter((c) => ({ ...c, userId: event.target.value || undefined, page: 1 }))}>
            <option value="">Everyone</option>
            {people.map((person) => (
              <option key={person.id} value={person.id}>
                {person.name}
              </option>
            ))}
          </select>
        </div>
      </div>
      <DataTable
        caption={`Audit log (page ${page.page} of ${pageCount})`}
        rows={page.entries}
        columns={columns}
        rowKey={(e) => String(e.id)}
        csvFileName={`audit-log-page-${page.page}.csv`}
        emptyMessage="No entries match the filter."
        filterable={false}
        compact
      />
      <nav aria-label="Pages of the audit log" className="flex items-center justify-between gap-3 text-small text-ink-700">
        <span aria-live="polite">
          {page.total} {page.total === 1 ? "entry" : "entries"}
          {pageCount > 1 ? ` · page ${page.page} of ${pageCount}` : ""}
        </span>
        <span className="flex gap-2">
          <Button variant="secondary" disabled={filter.page <= 1 || log.isFetching} onClick={() => setFilter((c) => ({ ...c, page: c.page - 1 }))}>
            Newer
          </Button>
          <Button variant="secondary" disabled={filter.page >= pageCount || log.isFetching} onClick={() => setFilter((c) => ({ ...c, page: c.page + 1 }))}>
            Older
          </Button>
        </span>
      </nav>
    </div>
  );
}
