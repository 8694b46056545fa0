import { invitationStatusLabels, invitationStatuses, roleLabels, type Invitation, type InvitationStatus } from "@tributary/contracts";
import { useId, useState } from "react";
import { DataTable, type DataTableColumn } from "../../../components/data-table/data-table";
import { Button } from "../../../components/ui/button";
import { ErrorState } from "../../../components/ui/error-state";
import { inputClass } from "../../../components/ui/field";
import { LoadingState } from "../../../components/ui/loading-state";
import { ApiError } from "../../../lib/api-client";
import { formatDateTime } from "../../../lib/format";
import { useInvitations } from "../api/get-invitations";
import { useResendInvitation } from "../api/resend-invitation";
import { useRevokeInvitation } from "../api/revoke-invitation";

const statusTone: Record<InvitationStatus, string> = {
  pending: "bg-caution-100 text-caution-700",
  expired: "bg-ink-100 text-ink-700",
  accepted: "bg-ok-100 text-ok-700",
  revoked: "bg-alert-100 text-alert-700",
};

/** Invitations with their status, to resend or revoke. */
export function InvitationsTable() {
  const id = useId();
  const [status, setStatus] = useState<InvitationStatus | "">("");
  const invitations = useInvitations(status || undefined);
  const resend = useResendInvitation();
  const revoke = useRevokeInvitation();
  const [message, setMessage] = useState<{ tone: "ok" | "alert"; text: string } | null>(null);
  const act = (kind: "resend" | "revoke", invitation: Invitation) => {
    setMessage(null);
    (kind === "resend" ? resend : revoke).mutate(invitation.id, {
      onSuccess: () => setMessage({ tone: "ok", text: kind === "resend" ? `A new link was sent to ${invitation.email}; the old one no longer works.` : `The invitation of ${invitation.email} is revoked.` }),
      onError: (error) => setMessage({ tone: "alert", text: error instanceof ApiError ? error.message : "That did not work. Please try again." }),
    });
  };
  const columns: DataTableColumn<Invitation>[] = [
    { id: "email", header: "E-mail", value: (i) => i.email, cell: (i) => <span className="font-medium">{i.email}</span> },
    { id: "role", header: "Role", value: (i) => roleLabels[i.role] },
    { id: "markets", header: "Markets", value: (i) => (i.role === "market_manager" ? i.markets.map((m) => m.name).join(", ") : "every market") },
    {
      id: "status",
      header: "Status",
      value: (i) => invitationStatusLabels[i.status],
      cell: (i) => <span className={`rounded-sm px-1.5 py-0.5 text-caption font-medium ${statusTone[i.status]}`}>{invitationStatusLabels[i.status]}</span>,
    },
    { id: "by", header: "Invited by", value: (i) => i.invitedBy?.name ?? null },
    { id: "sent", header: "Sent", value: (i) => i.createdAt, cell: (i) => <span className="whitespace-nowrap">{formatDateTime(i.createdAt)}</span> },
    {
      id: "expires",
      header: "Link works until",
      value: (i) => i.expiresAt,
      cell: (i) =>
        i.status === "accepted" ? (
          <span className="text-ink-700">accepted {i.acceptedAt ? formatDateTime(i.acceptedAt) : ""}{i.acceptedUser ? ` by ${i.acceptedUser.name}` : ""}</span>
        ) : i.status === "revoked" ? (
          <span className="text-ink-700">revoked {i.revokedAt ? formatDateTime(i.revokedAt) : ""}</span>
        ) : (
          <span className="whitespace-nowrap">{formatDateTime(i.expiresAt)}</span>
        ),
    },
    {
      id: "actions",
      header: "Actions",
      value: () => null,
      sortable: false,
      cell: (i) =>
        i.status === "pending" || i.status === "expired" ? (
          <span className="inline-flex gap-1">
            <Button variant="secondary" className="px-2! py-1!" onClick={() => act("resend", i)} disabled={resend.isPending} aria-label={`Resend the invitation to ${i.email}`}>
              Resend
            </Button>
            <Button variant="quiet" className="px-2! py-1!" onClick={() => act("revoke", i)} disabled={revoke.isPending} aria-label={`Revoke the invitation to ${i.email}`}>
              Revoke
            </Button>
          </span>
        ) : null,
    },
  ];
  return (
    <div className="space-y-3">
      <div>
        <label htmlFor={`${id}-status`} className="text-small font-medium text-ink-800">
          Show
        </label>
        <select id={`${id}-status`} className={`${inputClass} ml-2 inline-block w-48`} value={status} onChange={(event) => setStatus(event.target.value as InvitationStatus | "")}>
          <option value="">every invitation</option>
          {invitationStatuses.map((s) => (
            <option key={s} value={s}>
              {invitationStatusLabels[s].toLowerCase()}
            </option>
          ))}
        </select>
      </div>
      {message ? (
        <p role={message.tone === "alert" ? "alert" : "status"} className={`text-small font-medium ${message.tone === "alert" ? "text-alert-700" : "text-ok-700"}`}>
          {message.text}
        </p>
      ) : null}
      {invitations.isPending ? (
        <LoadingState label="Loading invitations…" />
      ) : invitations.isError ? (
        <ErrorState title="Invitations could not be loaded" message={invitations.error.message} onRetry={() => void invitations.refetch()} />
      ) : (
        <DataTable
          caption="Invitations"
          rows={invitations.data}
          columns={columns}
          rowKey={(i) => i.id}
          csvFileName="invitations.csv"
          emptyMessage={status ? "No invitations with this status." : "No invitations sent yet."}
          initialSort={{ id: "sent", desc: true }}
          pageSize={15}
        />
      )}
    </div>
  );
}
