// Uploaded files between "upload" and "save": parsed rows kept in memory for a short
// while, each visible only to the user who uploaded it. Nothing here reaches the
// database; a server restart forgets them (the user uploads again).
import { randomUUID } from "node:crypto";

export interface StoredUpload {
  readonly id: string;
  readonly userId: string;
  readonly fileName: string;
  readonly bytes: number;
  readonly header: readonly string[];
  readonly rows: readonly (readonly string[])[];
  readonly rowNumbers: readonly number[];
  readonly createdAt: number;
  readonly expiresAt: number;
}

export interface UploadStoreOptions {
  /** How long an upload is kept, in milliseconds. */
  readonly ttlMs: number;
  /** Uploads kept per user; the oldest goes first. */
  readonly maxPerUser?: number;
  readonly now?: () => number;
}

export class UploadStore {
  private readonly uploads = new Map<string, StoredUpload>();
  private readonly ttlMs: number;
  private readonly maxPerUser: number;
  private readonly now: () => number;

  constructor(options: UploadStoreOptions) {
    this.ttlMs = options.ttlMs;
    this.maxPerUser = options.maxPerUser ?? 3;
    this.now = options.now ?? Date.now;
  }

  put(userId: string, file: Omit<StoredUpload, "id" | "userId" | "createdAt" | "expiresAt">): StoredUpload {
    this.forgetExpired();
    const own = [...this.uploads.values()].filter((u) => u.userId === userId).sort((a, b) => a.createdAt - b.createdAt);
    for (const old of own.slice(0, Math.max(0, own.length - this.maxPerUser + 1))) this.uploads.delete(old.id);
    const createdAt = this.now();
    const upload: StoredUpload = { ...file, id: randomUUID(), userId, createdAt, expiresAt: createdAt + this.ttlMs };
    this.uploads.set(upload.id, upload);
    return upload;
  }

  /** The upload, if it exists, has not expired and belongs to the user. */
  get(id: string, userId: string): StoredUpload | null {
    const upload = this.uploads.get(id);
    if (!upload || upload.userId !== userId) return null;
    if (upload.expiresAt <= this.now()) {
      this.uploads.delete(id);
      return null;
    }
    return upload;
  }

  delete(id: string): void {
    this.uploads.delete(id);
  }

  get size(): number {
    return this.uploads.size;
  }

  private forgetExpired(): void {
    const now = this.now();
    for (const [id, upload] of this.uploads) if (upload.expiresAt <= now) this.uploads.delete(id);
  }
}
