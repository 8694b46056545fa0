import { columnMappingDraftSchema, uploadValidationSchema, type UploadValidation } from "@tributary/contracts";
import { useMutation } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";

export const validateUploadInput = z.object({
  uploadId: z.string().min(1),
  mapping: columnMappingDraftSchema,
});
export type ValidateUploadInput = z.infer<typeof validateUploadInput>;

/** Checks the uploaded rows under a column mapping: the validation report and a preview per cell. */
export function validateUpload({ uploadId, mapping }: ValidateUploadInput): Promise<UploadValidation> {
  return api.post(`/api/uploads/${encodeURIComponent(uploadId)}/validate`, uploadValidationSchema, { mapping });
}

export function useValidateUpload() {
  return useMutation({ mutationFn: validateUpload });
}
