import { datasetVersionDetailSchema, saveUploadInput as saveBody, type DatasetVersionDetail } from "@tributary/contracts";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";
import { datasetsQueryOptions } from "./get-datasets";

export const saveUploadInput = saveBody.extend({ uploadId: z.string().min(1) });
export type SaveUploadInput = z.infer<typeof saveUploadInput>;

/** Saves the upload under its mapping as a new, immutable dataset version. */
export function saveUpload({ uploadId, ...body }: SaveUploadInput): Promise<DatasetVersionDetail> {
  return api.post(`/api/uploads/${encodeURIComponent(uploadId)}/save`, datasetVersionDetailSchema, body);
}

export function useSaveUpload({ onSuccess }: { onSuccess?: (version: DatasetVersionDetail) => void } = {}) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: saveUpload,
    onSuccess: async (version) => {
      await queryClient.invalidateQueries({ queryKey: datasetsQueryOptions().queryKey });
      onSuccess?.(version);
    },
  });
}
