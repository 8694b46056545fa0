import { PUBLISH_REASON_MIN_LENGTH, publishRunInput as publishBody, runSchema, type Run } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";
import { runsQueryOptions } from "./get-runs";

/** The publish form: a written reason is required when the run is not trustworthy. */
export const publishRunInput = (trustworthy: boolean) =>
  publishBody.extend({ runId: z.string().min(1) }).refine((input) => trustworthy || (input.reason ?? "").trim().length >= PUBLISH_REASON_MIN_LENGTH, {
    path: ["reason"],
    message: `This run is not trustworthy: say in at least ${PUBLISH_REASON_MIN_LENGTH} characters why it should be published anyway`,
  });
export type PublishRunInput = z.infer<ReturnType<typeof publishRunInput>>;

/** Makes a finished run the portfolio's current fit; market managers are told by e-mail. */
export function publishRun({ runId, reason }: PublishRunInput): Promise<Run> {
  const body = reason && reason.trim() !== "" ? { reason: reason.trim() } : {};
  return api.post(`/api/runs/${encodeURIComponent(runId)}/publish`, runSchema, body);
}

export function usePublishRun() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: publishRun,
    // Publishing changes which run is current, so every run in the list may change.
    onSuccess: () => queryClient.invalidateQueries({ queryKey: runsQueryOptions().queryKey }),
  });
}
