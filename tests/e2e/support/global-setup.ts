// Runs once before the e2e project: builds the web app and starts the real API server
// that serves it, so every test file shares one build and one server. Tests read the
// server's address with inject("baseUrl"). The server fits and publishes the demo
// portfolio at start (DEMO_FIT=quick); setup waits for that run before any test starts.
import type { TestProject } from "vitest/node";
import { buildWebApp, startServer, waitForPublishedRun } from "./server";
import { demoUsers } from "./users";

declare module "vitest" {
  export interface ProvidedContext {
    /** Address of the shared server, e.g. http://127.0.0.1:40123. */
    baseUrl: string;
  }
}

export default async function setup(project: TestProject): Promise<() => Promise<void>> {
  buildWebApp();
  // The dashboards need a published run: the server fits the demo portfolio (a quick fit) by itself.
  const server = await startServer({ demoFit: "quick" });
  try {
    await waitForPublishedRun(server, demoUsers.admin, 20 * 60_000);
  } catch (error) {
    await server.stop();
    throw error;
  }
  project.provide("baseUrl", server.baseUrl);
  return () => server.stop();
}
