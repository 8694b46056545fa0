// Runs once before the e2e project: builds the web app and starts the real API server
// that serves it, so every test file shares one build and one server. Tests read the
// server's address with inject("baseUrl").
import type { TestProject } from "vitest/node";
import { buildWebApp, startServer } from "./server";

declare module "vitest" {
  export interface ProvidedContext {
    /** Address of the shared server, e.g. http://127.0.0.1:40123. */
    baseUrl: string;
  }
}

export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  buildWebApp();
  const server = await startServer();
  project.provide("baseUrl", server.baseUrl);
  return () => server.stop();
}
