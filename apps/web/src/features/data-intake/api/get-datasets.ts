import { datasetVersionSchema, type DatasetVersion } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";

const datasetListSchema = z.array(datasetVersionSchema);

/** Every saved dataset version, newest first. */
export function getDatasets(): Promise<DatasetVersion[]> {
  return api.get("/api/datasets", datasetListSchema);
}

export const datasetsQueryOptions = () => queryOptions({ queryKey: ["datasets"] as const, queryFn: getDatasets });

export function useDatasets() {
  return useQuery(datasetsQueryOptions());
}
