import { mailKindLabels, mailKinds, type OutboxMessageSummary } from "@tributary/contracts";
import { useId, useState, type FormEvent } from "react";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { Button } from "../../../components/ui/button";
import { EmptyState } from "../../../components/ui/empty-state";
import { ErrorState } from "../../../components/ui/error-state";
import { inputClass } from "../../../components/ui/field";
import { LoadingState } from "../../../components/ui/loading-state";
import { PageHeader } from "../../../components/ui/page-header";
import { formatDateTime } from "../../../lib/format";
import { useOutbox, type OutboxFilter } from "../api/get-outbox";
import { useOutboxMessage } from "../api/get-outbox-message";
import { MessageReader } from "./message-reader";

const PAGE_SIZE = 25;
const kindLabel = (kind: string) => (mailKindLabels as Record<string, string>)[kind] ?? kind;

function Reader({ messageId, onClose }: { messageId: string; onClose: () => void }) {
  const message = useOutboxMessage(messageId);
  if (message.isPending) return <LoadingState label="Opening the message…" />;
  if (message.isError) return <ErrorState title="The message could not be opened" message={message.error.message} onRetry={() => void message.refetch()} />;
  return <MessageReader message={message.data} onClose={onClose} />;
}

/** Every e-mail the product sent, to list, filter and read (the local stand-in for a mail service). */
export function Outbox() {
  const id = useId();
  const [filter, setFilter] = useState<OutboxFilter>({ page: 1, pageSize: PAGE_SIZE });
  const [recipient, setRecipient] = useState("");
  const [openId, setOpenId] = useState<string | null>(null);
  const outbox = useOutbox(filter);

  const applyRecipient = (event: FormEvent) => {
    event.preventDefault();
    setFilter((current) => ({ ...current, to: recipient.trim() === "" ? undefined : recipient.trim(), page: 1 }));
  };
  const columns: DataTableColumn<OutboxMessageSummary>[] = [
    { id: "when", header: "Sent", value: (m) => m.createdAt, cell: (m) => formatDateTime(m.createdAt) },
    { id: "to", header: "To", value: (m) => m.to, cell: (m) => (m.toUser ? `${m.to} (${m.toUser.name})` : m.to) },
    {
      id: "subject",
      header: "Subject",
      value: (m) => m.subject,
      cell: (m) => (
        <button type="button" className="text-left font-medium text-stream-700 underline-offset-2 hover:underline" onClick={() => setOpenId(m.id)} aria-label={`Read “${m.subject}” to ${m.to}`}>
          {m.subject}
        </button>
      ),
    },
    { id: "kind", header: "Kind", value: (m) => kindLabel(m.kind) },
  ];
  const page = outbox.data;
  const pageCount = page ? Math.max(1, Math.ceil(page.total / page.pageSize)) : 1;

  return (
    <>
      <PageHeader title="Outbox" description="In local mode, every e-mail the product sent, readable here instead of in a mailbox." />
      <form onSubmit={applyRecipient} aria-label="Filter messages" className="mb-4 flex flex-wrap items-end gap-4">
        <div>
          <label htmlFor={`${id}-kind`} className="block text-small font-medium text-ink-800">
            Kind
          </label>
          <select
            id={`${id}-kind`}
            className={`${inputClass} mt-1 w-56`}
            value={filter.kind ?? ""}
            onChange={(event) => setFilter((current) => ({ ...current, kind: event.target.value || undefined, page: 1 }))}
          >
            <option value="">Every kind</option>
            {mailKinds.map((kind) => (
              <option key={kind} value={kind}>
                {mailKindLabels[kind]}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor={`${id}-to`} className="block text-small font-medium text-ink-800">
            Recipient contains
          </label>
          <input id={`${id}-to`} type="search" maxLength={254} className={`${inputClass} mt-1 w-64`} value={recipient} onChange={(event) => setRecipient(event.target.value)} />
        </div>
        <Button type="submit" variant="secondary">
          Filter
        </Button>
        {filter.kind || filter.to ? (
          <Button
            variant="quiet"
            onClick={() => {
              setRecipient("");
              setFilter({ page: 1, pageSize: PAGE_SIZE });
            }}
          >
            Show every message
          </Button>
        ) : null}
      </form>

      {outbox.isPending ? (
        <LoadingState label="Loading the outbox…" />
      ) : outbox.isError ? (
        <ErrorState title="The outbox could not be loaded" message={outbox.error.message} onRetry={() => void outbox.refetch()} />
      ) : page && page.total === 0 && !filter.kind && !filter.to ? (
        <EmptyState title="No e-mails sent yet">Invitations, notices of newly published fits and plan decisions will be listed here as they are sent.</EmptyState>
      ) : page ? (
        <div className="space-y-3">
          <DataTable
            caption={`Messages sent (page ${page.page} of ${pageCount})`}
            rows={page.messages}
            columns={columns}
            rowKey={(m) => m.id}
            csvFileName={`outbox-page-${page.page}.csv`}
            emptyMessage="No message matches the filter."
            filterable={false}
          />
          <nav aria-label="Pages of the outbox" className="flex items-center justify-between gap-3 text-small text-ink-700">
            <span aria-live="polite">
              {page.total} {page.total === 1 ? "message" : "messages"}
              {pageCount > 1 ? ` · page ${page.page} of ${pageCount}` : ""}
            </span>
            <span className="flex gap-2">
              <Button variant="secondary" disabled={filter.page <= 1 || outbox.isFetching} onClick={() => setFilter((c) => ({ ...c, page: c.page - 1 }))}>
                Newer
              </Button>
              <Button variant="secondary" disabled={filter.page >= pageCount || outbox.isFetching} onClick={() => setFilter((c) => ({ ...c, page: c.page + 1 }))}>
                Older
              </Button>
            </span>
          </nav>
        </div>
      ) : null}
      {openId ? (
        <div className="mt-6">
          <Reader key={openId} messageId={openId} onClose={() => setOpenId(null)} />
        </div>
      ) : null}
    </>
  );
}
