// What the dashboards share: one root query key (so that a flag or a new publication
// refreshes every dashboard at once) and "no published run yet" read as no data.
import { ApiError } from "./api-client";

/** Every dashboard's query key starts with this. */
export const dashboardsQueryKey = ["dashboards"] as const;

/** A dashboard answers 404 before the first run is published: that is "nothing yet", not an error. */
export async function orNoPublishedRun<T>(request: Promise<T>): Promise<T | null> {
  try {
    return await request;
  } catch (error) {
    if (error instanceof ApiError && error.status === 404) return null;
    throw error;
  }
}

/** Query string from the parameters that are set, e.g. "?channel=tv". */
export function searchOf(params: Record<string, string | null | undefined>): string {
  const search = new URLSearchParams();
  for (const [key, value] of Object.entries(params)) if (value) search.set(key, value);
  const text = search.toString();
  return text === "" ? "" : `?${text}`;
}
