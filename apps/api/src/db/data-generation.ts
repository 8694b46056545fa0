// The data generation: a counter this process moves on every statement that may change
// the database. One server process owns a data directory (backup/data-dir-lock.ts) and
// PGlite runs inside it, so every write passes through the client wrapped here. A cache
// that remembers the generation its value was read at can tell, without a query, whether
// the database may have changed since: any write anywhere (a sign-out, a role change, a
// new market, a session renewed) moves the generation, and the cache reads again.
//
// The counter moves before such a statement is sent and again when it has finished (for
// a transaction: before BEGIN and after COMMIT or ROLLBACK). A value read while the
// generation stayed the same from before the read started to after it ended therefore
// reflects the database of that generation (see `readAt`).
import type { PGlite } from "@electric-sql/pglite";

export class DataGeneration {
  private value = 0;

  /** The current generation; equal numbers mean no write started or ended in between. */
  get current(): number {
    return this.value;
  }

  bump(): void {
    this.value++;
  }

  /**
   * Runs `read` and says at which generation its result is valid: a number when no write
   * started or finished while it ran, otherwise null (the result may still be used once,
   * but must not be cached).
   */
  async readAt<T>(read: () => Promise<T>): Promise<{ value: T; generation: number | null }> {
    const before = this.value;
    const value = await read();
    return { value, generation: this.value === before ? before : null };
  }
}

/**
 * Whether a statement only reads: a single SELECT that names nothing that writes. Anything
 * else (INSERT, UPDATE, DELETE, WITH …, DDL, SELECT … FOR UPDATE, SELECT … INTO, sequence
 * and settings functions, several statements) counts as a write; counting a read as a
 * write only costs a cache refresh. The schema's only function is a trigger that refuses
 * updates (drizzle/0001), so a SELECT cannot write through a function of ours.
 */
export function isReadOnlyStatement(sql: string): boolean {
  const text = sql.replace(/^(?:\s|\(|--[^\n]*\n|\/\*[\s\S]*?\*\/)+/, "");
  if (!/^select\b/i.test(text)) return false;
  if (/;\s*\S/.test(text)) return false;
  return !/\b(?:insert|update|delete|merge|truncate|into|copy|nextval|setval|set_config|lo_\w+|pg_advisory\w*|dblink\w*)\b/i.test(text);
}

const generations = new WeakMap<object, DataGeneration>();

/** The generation of a database built by createDatabase (undefined for a transaction or any other handle). */
export function dataGenerationOf(db: object): DataGeneration | undefined {
  return generations.get(db);
}

/** Makes `db` answer to dataGenerationOf with `generation`. */
export function registerDataGeneration(db: object, generation: DataGeneration): void {
  generations.set(db, generation);
}

/** Reads kept for the current generation, per database (see readThroughGeneration). */
const memos = new WeakMap<DataGeneration, { generation: number; values: Map<string, unknown> }>();
const MEMO_CAPACITY = 2_000;

function deepFreeze<T>(value: T): T {
  if (value !== null && typeof value === "object" && !Object.isFrozen(value) && !(value instanceof Date)) {
    Object.freeze(value);
    for (const inner of Object.values(value)) deepFreeze(inner);
  }
  return value;
}

/**
 * The result of `read` under `key`, reused until the next write. `key` must name
 * everything the read depends on; the read must depend on the database alone (not on
 * the clock — no now() — nor on anything in memory). On a handle without a generation
 * (a transaction, which may hold its own writes) it simply reads. Results are frozen,
 * deeply, because every later caller shares them.
 */
export async function readThroughGeneration<T>(db: object, key: string, read: () => Promise<T>): Promise<T> {
  const data = dataGenerationOf(db);
  if (!data) return read();
  const memo = memos.get(data);
  if (memo && memo.generation === data.current && memo.values.has(key)) return memo.values.get(key) as T;
  const result = await data.readAt(read);
  const value = deepFreeze(result.value);
  if (result.generation !== null && result.generation === data.current) {
    let now = memos.get(data);
    if (!now || now.generation !== result.generation || now.values.size >= MEMO_CAPACITY) {
      now = { generation: result.generation, values: new Map() };
      memos.set(data, now);
    }
    now.values.set(key, value);
  }
  return value;
}

/**
 * Wraps the client's public entry points (query and sql, exec, transaction) so every
 * statement that may write moves the generation before it is sent and after it finishes.
 * Every query of the app goes through these (Drizzle calls `query` and `transaction`).
 */
export function trackWrites(client: PGlite): DataGeneration {
  const generation = new DataGeneration();
  const query = client.query.bind(client);
  const exec = client.exec.bind(client);
  const transaction = client.transaction.bind(client);
  const around = async <T>(writes: boolean, run: () => Promise<T>): Promise<T> => {
    if (!writes) return run();
    generation.bump();
    try {
      return await run();
    } finally {
      generation.bump();
    }
  };
  const wrapped: Pick<PGlite, "query" | "exec" | "transaction"> = {
    query: (text, params, options) => around(!isReadOnlyStatement(text), () => query(text, params, options)),
    exec: (text, options) => around(true, () => exec(text, options)),
    transaction: (callback) => around(true, () => transaction(callback)),
  };
  Object.assign(client, wrapped);
  return generation;
}
