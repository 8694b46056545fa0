import { uploadCreatedSchema, type UploadCreated } from "@tributary/contracts";
import { useMutation } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";

/** The server's limit (UPLOAD_MAX_BYTES, 25 MB by default); checked here first so a large file is not sent in vain. */
export const MAX_UPLOAD_BYTES = 25 * 1024 * 1024;

const looksLikeCsv = (file: File) => /\.(csv|txt)$/i.test(file.name) || file.type === "text/csv" || file.type === "text/plain";

export const createUploadInput = z.object({
  file: z
    .custom<File>((value) => typeof File !== "undefined" && value instanceof File, "Choose a CSV file")
    .refine((file) => file.size > 0, "The file is empty")
    .refine((file) => file.size <= MAX_UPLOAD_BYTES, "The file is larger than 25 MB, the largest upload accepted")
    .refine(looksLikeCsv, "Choose a .csv file (comma-separated text); spreadsheets must be saved as CSV first"),
});
export type CreateUploadInput = z.infer<typeof createUploadInput>;

/** Sends a CSV file; the server reads it and guesses which column plays which role. */
export function createUpload({ file }: CreateUploadInput): Promise<UploadCreated> {
  const form = new FormData();
  form.append("file", file, file.name);
  return api.postForm("/api/uploads", uploadCreatedSchema, form);
}

export function useCreateUpload() {
  return useMutation({ mutationFn: (input: CreateUploadInput) => createUpload(createUploadInput.parse(input)) });
}
