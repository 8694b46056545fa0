import { outboxPageSchema, type OutboxPage } from "@tributary/contracts";
import { keepPreviousData, queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";

export type OutboxFilter = { kind?: string; to?: string; page: number; pageSize: number };

/** GET /api/outbox?kind=&to=&page=&pageSize=: the e-mails the product sent, newest first (admins). */
export function getOutbox(filter: OutboxFilter): Promise<OutboxPage> {
  const query = new URLSearchParams({ page: String(filter.page), pageSize: String(filter.pageSize) });
  if (filter.kind) query.set("kind", filter.kind);
  if (filter.to) query.set("to", filter.to);
  return api.get(`/api/outbox?${query.toString()}`, outboxPageSchema);
}

export const outboxQueryOptions = (filter: OutboxFilter) => queryOptions({ queryKey: ["outbox", "list", filter] as const, queryFn: () => getOutbox(filter), staleTime: 5_000 });

export function useOutbox(filter: OutboxFilter) {
  return useQuery({ ...outboxQueryOptions(filter), placeholderData: keepPreviousData });
}
