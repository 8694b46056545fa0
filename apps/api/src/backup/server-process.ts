// The real server as a child process, for the crash tests and the load benchmark: started
// on a free port with a data directory of the caller's, stopped gently or killed. It
// runs as one process (node with tsx's loader), so SIGKILL reaches the server itself
// rather than a launcher in front of it.
import { spawn, type ChildProcess } from "node:child_process";
import { join } from "node:path";
import { csrfCookieName, csrfHeaderName } from "../auth/csrf";
import { repoRoot } from "../config";

const serverEntry = join(repoRoot, "apps", "api", "src", "server.ts");
const KEPT_OUTPUT = 256 * 1024;

export interface ServerProcessOptions {
  readonly dataDir: string;
  /** Extra environment (DEMO_FIT, FIT_CHAIN_THREADS, test hooks…); PORT, DATA_DIR and LOG_LEVEL are set here. */
  readonly env?: Record<string, string>;
  /** How long to wait for "Tributary is running at …" (default 3 minutes: a loaded 2-core machine is slow). */
  readonly startTimeoutMs?: number;
  readonly logLevel?: string;
  /** Extra options for node itself, before the server's script (e.g. --cpu-prof for profiling). */
  readonly nodeOptions?: readonly string[];
}

export interface ServerProcess {
  readonly child: ChildProcess;
  /** Resolves with the base URL once the server listens; rejects if it exits first. */
  readonly ready: Promise<string>;
  /** What it printed so far (stdout and stderr; the latest 256 kB to 512 kB of a long run). */
  output(): string;
  /** Resolves when a printed line matches (already printed counts). */
  waitForOutput(pattern: RegExp, timeoutMs: number): Promise<string>;
  /** Resolves with the exit code (or the signal's name) when it exits. */
  readonly exited: Promise<number | string>;
  /** SIGKILL: no shutdown code runs. */
  kill(): Promise<number | string>;
  /** SIGTERM, then SIGKILL after `graceMs`. */
  stop(graceMs?: number): Promise<number | string>;
}

export function spawnServer(options: ServerProcessOptions): ServerProcess {
  const child = spawn(process.execPath, [...(options.nodeOptions ?? []), "--import", "tsx", serverEntry], {
    cwd: repoRoot,
    env: {
      ...process.env,
      NODE_ENV: "test",
      LOG_LEVEL: options.logLevel ?? "warn",
      DEMO_FIT: "off",
      ...options.env,
      PORT: "0",
      DATA_DIR: options.dataDir,
    },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let log = "";
  const watchers = new Set<() => void>();
  const append = (chunk: Buffer) => {
    log += chunk.toString();
    // A long run (the load benchmark logs every request) keeps only the latest output.
    if (log.length > 2 * KEPT_OUTPUT) log = log.slice(-KEPT_OUTPUT);
    for (const watcher of [...watchers]) watcher();
  };
  child.stdout?.on("data", append);
  child.stderr?.on("data", append);
  const exited = new Promise<number | string>((resolve) => child.once("exit", (code, signal) => resolve(code ?? signal ?? "unknown")));

  const waitForOutput = (pattern: RegExp, timeoutMs: number) =>
    new Promise<string>((resolve, reject) => {
      const check = () => {
        const match = pattern.exec(log);
        if (!match) return false;
        finish();
        resolve(match[0]);
        return true;
      };
      const timer = setTimeout(() => {
        finish();
        reject(new Error(`The server did not print ${pattern} within ${timeoutMs / 1000} s. Its output:\n${log.slice(-4000)}`));
      }, timeoutMs);
      const onExit = (code: number | string) => {
        if (check()) return;
        finish();
        reject(new Error(`The server exited (${code}) before printing ${pattern}. Its output:\n${log.slice(-4000)}`));
      };
      const finish = () => {
        clearTimeout(timer);
        watchers.delete(watcher);
      };
      const watcher = () => void check();
      if (check()) return;
      watchers.add(watcher);
      void exited.then(onExit);
    });

  const ready = waitForOutput(/Tributary is running at http:\/\/localhost:(\d+)/, options.startTimeoutMs ?? 180_000).then((line) => {
    const port = /:(\d+)$/.exec(line)![1];
    return `http://127.0.0.1:${port}`;
  });
  // Callers that never await `ready` (a start expected to fail) must not see an unhandled rejection.
  ready.catch(() => undefined);

  const signal = async (name: NodeJS.Signals) => {
    if (child.exitCode === null && child.signalCode === null) child.kill(name);
    return exited;
  };
  return {
    child,
    ready,
    output: () => log,
    waitForOutput,
    exited,
    kill: () => signal("SIGKILL"),
    stop: async (graceMs = 10_000) => {
      if (child.exitCode !== null || child.signalCode !== null) return exited;
      child.kill("SIGTERM");
      const timer = setTimeout(() => child.kill("SIGKILL"), graceMs);
      const code = await exited;
      clearTimeout(timer);
      return code;
    },
  };
}

/** A signed-in HTTP client of a running server (keeps its cookies, sends JSON). */
export class ApiClient {
  private cookies = new Map<string, string>();

  constructor(readonly baseUrl: string) {}

  static async signIn(baseUrl: string, who: { email: string; password: string }): Promise<ApiClient> {
    const client = new ApiClient(baseUrl);
    await client.json("POST", "/api/auth/sign-in", { email: who.email, password: who.password }, 200);
    return client;
  }

  /** The Cookie header value (for other HTTP clients, e.g. the load generator). */
  cookieHeader(): string {
    return [...this.cookies].map(([name, value]) => `${name}=${value}`).join("; ");
  }

  async request(method: string, path: string, body?: BodyInit | object): Promise<Response> {
    const headers: Record<string, string> = {};
    if (this.cookies.size > 0) headers.cookie = this.cookieHeader();
    // The session's token, as the web app sends it with every write.
    const token = this.cookies.get(csrfCookieName);
    if (token && method !== "GET" && method !== "HEAD") headers[csrfHeaderName] = decodeURIComponent(token);
    let payload: BodyInit | undefined;
    if (body instanceof FormData || typeof body === "string") payload = body;
    else if (body !== undefined) {
      headers["content-type"] = "application/json";
      payload = JSON.stringify(body);
    }
    const response = await fetch(`${this.baseUrl}${path}`, { method, headers, body: payload });
    for (const line of response.headers.getSetCookie()) {
      const [pair] = line.split(";");
      const at = pair!.indexOf("=");
      if (at > 0) this.cookies.set(pair!.slice(0, at).trim(), pair!.slice(at + 1).trim());
    }
    return response;
  }

  /** A JSON request that must answer `expected`; returns the parsed body. */
  async json<T = unknown>(method: string, path: string, body?: BodyInit | object, expected = 200): Promise<T> {
    const response = await this.request(method, path, body);
    const text = await response.text();
    if (response.status !== expected) throw new Error(`${method} ${path} answered ${response.status} (expected ${expected}): ${text.slice(0, 500)}`);
    return (text === "" ? null : JSON.parse(text)) as T;
  }
}

/** Polls `probe` every `intervalMs` until it returns a value other than undefined. */
export async function pollUntil<T>(what: string, probe: () => Promise<T | undefined>, timeoutMs: number, intervalMs = 250): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  let lastError: unknown = null;
  while (Date.now() < deadline) {
    try {
      const value = await probe();
      if (value !== undefined) return value;
    } catch (error) {
      lastError = error;
    }
    await new Promise((resolve) => setTimeout(resolve, intervalMs));
  }
  throw new Error(`Timed out after ${timeoutMs / 1000} s waiting for ${what}${lastError ? ` (last error: ${lastError instanceof Error ? lastError.message : String(lastError)})` : ""}`);
}
