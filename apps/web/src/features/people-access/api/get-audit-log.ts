import { auditLogPageSchema, type AuditLogPage } from "@tributary/contracts";
import { keepPreviousData, queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";

export type AuditLogFilter = { action?: string; userId?: string; page: number; pageSize: number };

/** GET /api/audit-log?action=&userId=&page=&pageSize=: who changed what, newest first (admins). */
export function getAuditLog(filter: AuditLogFilter): Promise<AuditLogPage> {
  const query = new URLSearchParams({ page: String(filter.page), pageSize: String(filter.pageSize) });
  if (filter.action) query.set("action", filter.action);
  if (filter.userId) query.set("userId", filter.userId);
  return api.get(`/api/audit-log?${query.toString()}`, auditLogPageSchema);
}

export const auditLogQueryKey = ["audit-log"] as const;

export const auditLogQueryOptions = (filter: AuditLogFilter) => queryOptions({ queryKey: [...auditLogQueryKey, filter] as const, queryFn: () => getAuditLog(filter) });

export function useAuditLog(filter: AuditLogFilter) {
  return useQuery({ ...auditLogQueryOptions(filter), placeholderData: keepPreviousData });
}
