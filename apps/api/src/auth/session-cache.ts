// The signed-in users of recent requests, so a request with an unchanged session costs no
// database round trip. An entry is the outcome of a full check (lucia's validation, the
// disabled flag, the user's markets) and is only used while the data generation (see
// db/data-generation.ts) is the one it was read at: any write anywhere — a sign-out, a
// role or market change, a disabled user, a renewed session — empties the cache. Time is
// checked on every use: an entry is not used once its session has expired or reached the
// second half of its life (when lucia renews it, which is a write), so those requests
// take the full path.
import type { CurrentUser } from "@tributary/contracts";
import type { DataGeneration } from "../db/data-generation";

export interface CachedSession {
  readonly user: CurrentUser;
  /** When the session expires (ms since the epoch). */
  readonly expiresAt: number;
  /** From this moment lucia would renew the session, so the full path must run. */
  readonly renewFrom: number;
  /** The session's CSRF token (csrf.ts), derived from its id. */
  readonly csrfToken: string;
}

export class SessionCache {
  private generation = -1;
  private readonly entries = new Map<string, CachedSession>();

  constructor(
    private readonly data: DataGeneration,
    private readonly capacity = 10_000,
  ) {}

  /** The entry for a session id, if it was read at the current generation and the session is in the first half of its life. */
  get(sessionId: string, now: number): CachedSession | null {
    if (this.generation !== this.data.current) {
      this.entries.clear();
      return null;
    }
    const entry = this.entries.get(sessionId);
    if (!entry) return null;
    if (now >= entry.renewFrom || now >= entry.expiresAt) {
      this.entries.delete(sessionId);
      return null;
    }
    return entry;
  }

  /** Keeps an entry read at `generation` (a number only if nothing was written while it was read; see DataGeneration.readAt). */
  set(sessionId: string, generation: number | null, entry: CachedSession): void {
    if (generation === null || generation !== this.data.current) return;
    if (this.generation !== generation || this.entries.size >= this.capacity) {
      this.entries.clear();
      this.generation = generation;
    }
    this.entries.set(sessionId, entry);
  }
}
