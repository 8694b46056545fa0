import { liftTestInputSchema, liftTestsCreatedSchema, type LiftTestInput, type LiftTestsCreated } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { liftTestsQueryOptions } from "./get-lift-tests";

export { liftTestInputSchema as createLiftTestInput };

/** Records one lift test, entered by hand, against a dataset version. */
export function createLiftTest(datasetId: string, input: LiftTestInput): Promise<LiftTestsCreated> {
  return api.post(`/api/datasets/${encodeURIComponent(datasetId)}/lift-tests`, liftTestsCreatedSchema, input);
}

export function useCreateLiftTest(datasetId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: LiftTestInput) => createLiftTest(datasetId, liftTestInputSchema.parse(input)),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: liftTestsQueryOptions(datasetId).queryKey }),
  });
}
