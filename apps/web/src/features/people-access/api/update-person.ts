import { personSchema, personUpdateInput, type Person, type PersonUpdateInput } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { auditLogQueryKey } from "./get-audit-log";
import { peopleQueryOptions } from "./get-people";

export { personUpdateInput };

/** PATCH /api/people/:userId: role, markets or disabled; the person's sessions end on a change of role or when disabled. */
export function updatePerson({ userId, ...input }: PersonUpdateInput & { userId: string }): Promise<Person> {
  return api.patch(`/api/people/${encodeURIComponent(userId)}`, personSchema, personUpdateInput.parse(input));
}

export function useUpdatePerson() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updatePerson,
    onSuccess: () => Promise.all([queryClient.invalidateQueries({ queryKey: peopleQueryOptions().queryKey }), queryClient.invalidateQueries({ queryKey: auditLogQueryKey })]),
  });
}
