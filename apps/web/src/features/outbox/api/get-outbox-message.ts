import { outboxMessageSchema, type OutboxMessage } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";

/** GET /api/outbox/:messageId: one whole message, text and HTML (the HTML is shown only in a sandboxed frame). */
export function getOutboxMessage(messageId: string): Promise<OutboxMessage> {
  return api.get(`/api/outbox/${encodeURIComponent(messageId)}`, outboxMessageSchema);
}

export const outboxMessageQueryOptions = (messageId: string) =>
  queryOptions({ queryKey: ["outbox", "message", messageId] as const, queryFn: () => getOutboxMessage(messageId), staleTime: Infinity });

export function useOutboxMessage(messageId: string | null) {
  return useQuery({ ...outboxMessageQueryOptions(messageId ?? ""), enabled: messageId !== null });
}
