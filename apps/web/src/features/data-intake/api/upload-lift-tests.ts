import { liftTestsCreatedSchema, type LiftTestsCreated } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";
import { liftTestsQueryOptions } from "./get-lift-tests";

export const uploadLiftTestsInput = z.object({
  file: z
    .custom<File>((value) => typeof File !== "undefined" && value instanceof File, "Choose a CSV file of lift tests")
    .refine((file) => file.size > 0, "The file is empty")
    .refine((file) => file.size <= 5 * 1024 * 1024, "A lift-test file must be smaller than 5 MB")
    .refine((file) => /\.(csv|txt)$/i.test(file.name) || file.type === "text/csv", "Choose a .csv file"),
});
export type UploadLiftTestsInput = z.infer<typeof uploadLiftTestsInput>;

/** Uploads a CSV of lift tests; all of them are stored, or none when one is wrong. */
export function uploadLiftTests(datasetId: string, { file }: UploadLiftTestsInput): Promise<LiftTestsCreated> {
  const form = new FormData();
  form.append("file", file, file.name);
  return api.postForm(`/api/datasets/${encodeURIComponent(datasetId)}/lift-tests`, liftTestsCreatedSchema, form);
}

export function useUploadLiftTests(datasetId: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: UploadLiftTestsInput) => uploadLiftTests(datasetId, uploadLiftTestsInput.parse(input)),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: liftTestsQueryOptions(datasetId).queryKey }),
  });
}
