// Builds the web app and starts the real API server (which serves it) on a free port
// with a fresh, temporary data directory.
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { mkdtempSync, rmSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";

export const repoRoot = fileURLToPath(new URL("../../../", import.meta.url));
const bin = (name: string) => join(repoRoot, "node_modules", ".bin", name);

export function buildWebApp(): void {
  const result = spawnSync(bin("vite"), ["build", "--logLevel", "error"], { cwd: repoRoot, encoding: "utf8" });
  if (result.status !== 0) throw new Error(`vite build failed:\n${result.stdout}\n${result.stderr}`);
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.once("error", reject);
    probe.listen(0, "127.0.0.1", () => {
      const address = probe.address();
      const port = typeof address === "object" && address ? address.port : 0;
      probe.close(() => resolve(port));
    });
  });
}

export type RunningServer = { baseUrl: string; stop: () => Promise<void>; output: () => string };

async function waitForHealth(baseUrl: string, child: ChildProcess, output: () => string, timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`The API server exited (code ${child.exitCode}):\n${output()}`);
    try {
      const response = await fetch(`${baseUrl}/api/health`);
      if (response.ok) return;
    } catch {
      // Not listening yet.
    }
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  throw new Error(`The API server did not answer /api/health within ${timeoutMs / 1000} s:\n${output()}`);
}

export type ServerOptions = {
  /** How the server fits and publishes the demo portfolio at first start (the API's DEMO_FIT). */
  demoFit?: "off" | "quick" | "full";
};

export async function startServer({ demoFit = "off" }: ServerOptions = {}): Promise<RunningServer> {
  const port = await freePort();
  const dataDir = mkdtempSync(join(tmpdir(), "tributary-e2e-"));
  const child = spawn(bin("tsx"), [join(repoRoot, "apps/api/src/server.ts")], {
    cwd: repoRoot,
    env: { ...process.env, PORT: String(port), DATA_DIR: dataDir, LOG_LEVEL: "warn", NODE_ENV: "test", DEMO_FIT: demoFit },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let log = "";
  child.stdout?.on("data", (chunk: Buffer) => (log += chunk.toString()));
  child.stderr?.on("data", (chunk: Buffer) => (log += chunk.toString()));
  const baseUrl = `http://127.0.0.1:${port}`;
  const stop = async () => {
    if (child.exitCode === null) {
      const exited = new Promise((resolve) => child.once("exit", resolve));
      child.kill("SIGTERM");
      await Promise.race([exited, new Promise((resolve) => setTimeout(resolve, 6_000))]);
      if (child.exitCode === null) child.kill("SIGKILL");
    }
    rmSync(dataDir, { recursive: true, force: true });
  };
  try {
    await waitForHealth(baseUrl, child, () => log, 180_000);
  } catch (error) {
    await stop();
    throw error;
  }
  return { baseUrl, stop, output: () => log };
}

/**
 * Waits until the server answers GET /api/runs/current with a published run (the demo
 * fit it starts by itself), signed in as `who`; returns how long that took.
 */
export async function waitForPublishedRun(server: RunningServer, who: { email: string; password: string }, timeoutMs: number): Promise<number> {
  const started = Date.now();
  const signIn = await fetch(`${server.baseUrl}/api/auth/sign-in`, {
    method: "POST",
    headers: { "Content-Type": "application/json" },
    body: JSON.stringify({ email: who.email, password: who.password }),
  });
  if (!signIn.ok) throw new Error(`Signing in to wait for the demo fit failed (HTTP ${signIn.status})`);
  const cookie = (signIn.headers.get("set-cookie") ?? "").split(";")[0] ?? "";
  let last = "";
  while (Date.now() - started < timeoutMs) {
    const response = await fetch(`${server.baseUrl}/api/runs/current`, { headers: { cookie } });
    if (response.ok) return Date.now() - started;
    last = `HTTP ${response.status}: ${(await response.text()).slice(0, 300)}`;
    await new Promise((resolve) => setTimeout(resolve, 2_000));
  }
  throw new Error(`No run was published within ${timeoutMs / 1000} s (last answer ${last}):\n${server.output().slice(-4000)}`);
}
