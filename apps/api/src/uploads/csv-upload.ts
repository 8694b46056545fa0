// Multipart uploads of one CSV file (multer, memory storage), with a clear message for
// every way an upload can go wrong before its content is read.
import multer, { MulterError } from "multer";
import type { Request, RequestHandler } from "express";
import { Invalid, TooLarge } from "../http/errors";

/** The multipart form field that carries the file. */
export const uploadField = "file";

export function formatBytes(bytes: number): string {
  if (bytes >= 1024 * 1024) return `${Math.round((bytes / (1024 * 1024)) * 10) / 10} MB`;
  if (bytes >= 1024) return `${Math.round((bytes / 1024) * 10) / 10} KB`;
  return `${bytes} bytes`;
}

function uploadError(error: unknown, maxBytes: number): Error {
  if (error instanceof MulterError) {
    switch (error.code) {
      case "LIMIT_FILE_SIZE":
        return new TooLarge(
          `The file is larger than ${formatBytes(maxBytes)}, the largest upload accepted. Leave out columns you do not need, or split the file by year.`,
        );
      case "LIMIT_FILE_COUNT":
        return new Invalid("Upload one file at a time");
      case "LIMIT_UNEXPECTED_FILE":
        return new Invalid(`Send the CSV file in the form field "${uploadField}"`);
      default:
        return new Invalid(`The upload could not be read: ${error.message}`);
    }
  }
  // busboy: a body that is not a complete multipart form.
  return new Invalid("The upload was cut off or is not a multipart form; try again");
}

/** Reads one file from the multipart field "file" into memory, refusing anything over `maxBytes`. */
export function csvUpload(maxBytes: number): RequestHandler {
  const single = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: maxBytes, files: 1, fields: 10, fieldSize: 64 * 1024, parts: 12 },
  }).single(uploadField);
  return (req, res, next) => {
    single(req, res, (error?: unknown) => (error ? next(uploadError(error, maxBytes)) : next()));
  };
}

export interface UploadedText {
  readonly fileName: string;
  readonly bytes: number;
  readonly text: string;
}

/** The uploaded file as text (UTF-8; invalid bytes become U+FFFD, which the intake reports). */
export function uploadedText(req: Request): UploadedText {
  const file = req.file;
  if (!file) throw new Invalid(`Choose a CSV file to upload (multipart form field "${uploadField}")`);
  const fileName = (file.originalname || "upload.csv").slice(0, 200);
  return { fileName, bytes: file.size, text: new TextDecoder("utf-8").decode(file.buffer) };
}
