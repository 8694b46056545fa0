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

/** Which UTF-16 byte order the bytes show without a byte-order mark: NUL in every other byte of mostly-ASCII text. */
function utf16WithoutMark(bytes: Uint8Array): "utf-16le" | "utf-16be" | null {
  const n = Math.min(bytes.length - (bytes.length % 2), 4096);
  if (n < 8) return null;
  let evenZeros = 0;
  let oddZeros = 0;
  for (let i = 0; i < n; i += 2) {
    if (bytes[i] === 0) evenZeros++;
    if (bytes[i + 1] === 0) oddZeros++;
  }
  const pairs = n / 2;
  if (oddZeros >= 0.9 * pairs && evenZeros <= 0.1 * pairs) return "utf-16le";
  if (evenZeros >= 0.9 * pairs && oddZeros <= 0.1 * pairs) return "utf-16be";
  return null;
}

/**
 * An uploaded file's bytes as text. Decided: UTF-8 (with or without a byte-order mark)
 * and UTF-16 (spreadsheets' "Unicode text"; with a byte-order mark, or plainly recognisable
 * without one) are read; anything else (Latin-1, Windows-1252, other code pages) is decoded
 * as UTF-8 with its invalid bytes as U+FFFD, which the intake refuses naming the line —
 * guessing a code page could silently change names.
 */
export function decodeUploadedBytes(bytes: Uint8Array): string {
  if (bytes[0] === 0xff && bytes[1] === 0xfe) return new TextDecoder("utf-16le").decode(bytes.subarray(2));
  if (bytes[0] === 0xfe && bytes[1] === 0xff) return new TextDecoder("utf-16be").decode(bytes.subarray(2));
  const utf16 = utf16WithoutMark(bytes);
  if (utf16) return new TextDecoder(utf16).decode(bytes);
  return new TextDecoder("utf-8").decode(bytes);
}

/** The uploaded file as text (see decodeUploadedBytes). */
export function uploadedText(req: Request): UploadedText {
  const file = req.file;
  if (!file) throw new Invalid(`Choose a CSV file to upload (multipart form field "${uploadField}")`);
  const fileName = (file.originalname || "upload.csv").slice(0, 200);
  return { fileName, bytes: file.size, text: decodeUploadedBytes(file.buffer) };
}
