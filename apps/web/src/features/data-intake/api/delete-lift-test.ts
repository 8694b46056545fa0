import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";
import { liftTestsQueryOptions } from "./get-lift-tests";

export const deleteLiftTestInput = z.object({ liftTestId: z.string().min(1) });
export type DeleteLiftTestInput = z.infer<typeof deleteLiftTestInput>;

export function deleteLiftTest(datasetId: string, { liftTestId }: DeleteLiftTestInput): Promise<void> {
  return api.delete(`/api/datasets/${encodeURIComponent(datasetId)}/lift-tests/${encodeURIComponent(liftTestId)}`, null);
}

export function useDeleteLiftTest(datasetId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: DeleteLiftTestInput) => deleteLiftTest(datasetId, deleteLiftTestInput.parse(input)),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: liftTestsQueryOptions(datasetId).queryKey }),
  });
}
