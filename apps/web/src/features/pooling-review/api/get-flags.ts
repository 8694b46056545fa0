import { flagSchema, type Flag } from "@tributary/contracts";
import { queryOptions, useQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";

const flagListSchema = z.array(flagSchema);

/** Every flag, active and cleared, newest first, with who raised or cleared it and when. */
export function getFlags(): Promise<Flag[]> {
  return api.get("/api/flags?status=all", flagListSchema);
}

export const flagsQueryOptions = () => queryOptions({ queryKey: ["flags", "all"] as const, queryFn: getFlags });

export function useFlags() {
  return useQuery(flagsQueryOptions());
}

export const flagsCsvHref = "/api/flags/export.csv?status=all";
