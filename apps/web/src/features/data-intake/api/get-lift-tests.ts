import { liftTestRecordSchema, type LiftTestRecord } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";
import { datasetQueryOptions } from "./get-dataset";

const liftTestListSchema = z.array(liftTestRecordSchema);

/** The lift tests recorded against a dataset version. */
export function getLiftTests(datasetId: string): Promise<LiftTestRecord[]> {
  return api.get(`/api/datasets/${encodeURIComponent(datasetId)}/lift-tests`, liftTestListSchema);
}

export const liftTestsQueryOptions = (datasetId: string) =>
  queryOptions({
    queryKey: [...datasetQueryOptions(datasetId).queryKey, "lift-tests"] as const,
    queryFn: () => getLiftTests(datasetId),
  });

export function useLiftTests(datasetId: string) {
  return useQuery(liftTestsQueryOptions(datasetId));
}
