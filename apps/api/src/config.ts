// Settings read from the environment once at start; tests build them directly.
import { readFileSync } from "node:fs";
import { availableParallelism } from "node:os";
import { fileURLToPath } from "node:url";
import { smtpSettingsFromEnv, type SmtpSettings } from "./mail/smtp";

export interface AppConfig {
  /** Shown by GET /api/health. */
  readonly version: string;
  /** Express "trust proxy": set when behind a proxy so https and client IPs are seen. */
  readonly trustProxy: boolean | number | string;
  /** A session unused for this many days expires (sliding: use extends it). */
  readonly sessionIdleDays: number;
  /** Sign-in attempts allowed per IP and e-mail in one window. */
  readonly signInLimit: { readonly attempts: number; readonly windowMinutes: number };
  /** Directory of the built web app to serve, with an SPA fallback; none in tests. */
  readonly webDistDir: string | null;
  /** pino level: "info" by default, "silent" in tests. */
  readonly logLevel: string;
  /** Largest accepted upload (CSV of weekly data or lift tests), in bytes. */
  readonly uploadMaxBytes: number;
  /** An upload not saved within this many minutes is forgotten. */
  readonly uploadTtlMinutes: number;
  /** Fits run at the same time; more wait in the queue. */
  readonly fitConcurrency: number;
  /** Threads one fit may use for its chains; default: the cores shared out among the concurrent fits. */
  readonly fitChainThreads: number;
  /** The address people reach the app at (links in e-mails); taken from each request when null. */
  readonly publicUrl: string | null;
  /** SMTP delivery of e-mail; null: the outbox table only (local mode). */
  readonly smtp: SmtpSettings | null;
}

export const repoRoot = fileURLToPath(new URL("../../../", import.meta.url));

export function apiVersion(): string {
  const pkg = JSON.parse(readFileSync(new URL("../package.json", import.meta.url), "utf8")) as { version?: string };
  return pkg.version ?? "0.0.0";
}

export const defaultConfig: AppConfig = {
  version: apiVersion(),
  trustProxy: false,
  sessionIdleDays: 30,
  signInLimit: { attempts: 10, windowMinutes: 15 },
  webDistDir: null,
  logLevel: "info",
  uploadMaxBytes: 25 * 1024 * 1024,
  uploadTtlMinutes: 60,
  fitConcurrency: 1,
  fitChainThreads: availableParallelism(),
  publicUrl: null,
  smtp: null,
};

function positiveInteger(env: NodeJS.ProcessEnv, name: string, fallback: number): number {
  const value = positiveNumber(env, name, fallback);
  if (!Number.isInteger(value)) throw new Error(`${name} must be a whole number, got "${env[name]}"`);
  return value;
}

function positiveNumber(env: NodeJS.ProcessEnv, name: string, fallback: number): number {
  const raw = env[name];
  if (raw === undefined || raw === "") return fallback;
  const value = Number(raw);
  if (!Number.isFinite(value) || value <= 0) throw new Error(`${name} must be a positive number, got "${raw}"`);
  return value;
}

function trustProxyFrom(raw: string | undefined): boolean | number | string {
  if (raw === undefined || raw === "" || raw === "false") return false;
  if (raw === "true") return true;
  return /^\d+$/.test(raw) ? Number(raw) : raw;
}

function publicUrlFrom(raw: string | undefined): string | null {
  if (raw === undefined || raw === "") return null;
  const url = URL.canParse(raw) ? new URL(raw) : null;
  if (!url || (url.protocol !== "http:" && url.protocol !== "https:")) throw new Error(`PUBLIC_URL must be an http(s) address, got "${raw}"`);
  return url.origin + url.pathname.replace(/\/+$/, "");
}

/** Config from environment variables (see apps/api/README.md). Throws a clear message on bad values. */
export function configFromEnv(env: NodeJS.ProcessEnv, webDistDir: string | null): AppConfig {
  const fitConcurrency = positiveInteger(env, "FIT_CONCURRENCY", defaultConfig.fitConcurrency);
  return {
    ...defaultConfig,
    trustProxy: trustProxyFrom(env.TRUST_PROXY),
    sessionIdleDays: positiveNumber(env, "SESSION_IDLE_DAYS", defaultConfig.sessionIdleDays),
    signInLimit: {
      attempts: positiveNumber(env, "SIGN_IN_ATTEMPTS", defaultConfig.signInLimit.attempts),
      windowMinutes: defaultConfig.signInLimit.windowMinutes,
    },
    webDistDir,
    logLevel: env.LOG_LEVEL || defaultConfig.logLevel,
    uploadMaxBytes: positiveInteger(env, "UPLOAD_MAX_BYTES", defaultConfig.uploadMaxBytes),
    uploadTtlMinutes: positiveNumber(env, "UPLOAD_TTL_MINUTES", defaultConfig.uploadTtlMinutes),
    fitConcurrency,
    fitChainThreads: positiveInteger(env, "FIT_CHAIN_THREADS", Math.max(1, Math.floor(availableParallelism() / fitConcurrency))),
    publicUrl: publicUrlFrom(env.PUBLIC_URL),
    smtp: smtpSettingsFromEnv(env),
  };
}
