import { describe, expect, it } from "vitest";
import { configFromEnv, defaultConfig } from "./config";

describe("configFromEnv", () => {
  it("reads the upload and fit settings, sharing the cores out among concurrent fits by default", () => {
    const config = configFromEnv({ UPLOAD_MAX_BYTES: "1048576", UPLOAD_TTL_MINUTES: "15", FIT_CONCURRENCY: "2" }, null);
    expect(config.uploadMaxBytes).toBe(1_048_576);
    expect(config.uploadTtlMinutes).toBe(15);
    expect(config.fitConcurrency).toBe(2);
    expect(config.fitChainThreads).toBe(Math.max(1, Math.floor(defaultConfig.fitChainThreads / 2)));
    expect(configFromEnv({ FIT_CHAIN_THREADS: "1" }, null).fitChainThreads).toBe(1);
    expect(configFromEnv({}, null)).toMatchObject({ uploadMaxBytes: 25 * 1024 * 1024, fitConcurrency: 1 });
  });

  it.each([
    ["FIT_CONCURRENCY", "0", "FIT_CONCURRENCY must be a positive number"],
    ["FIT_CONCURRENCY", "1.5", "FIT_CONCURRENCY must be a whole number"],
    ["UPLOAD_MAX_BYTES", "lots", "UPLOAD_MAX_BYTES must be a positive number"],
  ])("refuses %s=%s with a clear message", (name, value, message) => {
    expect(() => configFromEnv({ [name]: value }, null)).toThrow(message);
  });
});
