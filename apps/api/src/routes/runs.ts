// Fit runs. Decided: every run route but /api/runs/current is for analysts and admins
// (who see every market); market managers and portfolio leads are refused with 403.
// /api/runs/current is open to every role and filters the estimates to the viewer's
// markets centrally (runResultsFor), so no other market's numbers reach a market manager.
import {
  publishRunInput,
  runStatuses,
  startRunInput,
  type Run,
  type RunEvent,
  type RunReport,
  type RunResults,
  type RunStatus,
} from "@tributary/contracts";
import { defineRoute, markets, signedIn } from "../access/route-table";
import { Invalid, NotFound } from "../http/errors";
import { currentRunId, listRunRecords, runRecord } from "../runs/run-queries";
import { publishRun } from "../runs/publish-run";
import { appBaseUrl } from "../mail/messages";
import { notifyRunPublished } from "../mail/run-published";
import { runReportOf, runResultsFor } from "../runs/run-results";

const fitRoles = ["analyst", "admin"] as const;
const HEARTBEAT_MS = 15_000;

function statusesOf(raw: unknown): RunStatus[] | undefined {
  if (raw === undefined) return undefined;
  const list = (Array.isArray(raw) ? raw : [raw]).flatMap((v) => (typeof v === "string" ? v.split(",") : [])).map((v) => v.trim()).filter(Boolean);
  for (const status of list) {
    if (!(runStatuses as readonly string[]).includes(status)) throw new Invalid(`Unknown run status "${status}"; use ${runStatuses.join(", ")}`);
  }
  return list as RunStatus[];
}

export const runRoutes = [
  defineRoute({
    method: "post",
    path: "/api/runs",
    access: signedIn(markets.unscoped, fitRoles),
    handler: async ({ req, res, db, user, runs: service }): Promise<Run> => {
      const input = startRunInput.parse(req.body ?? {});
      const runId = await service.start({ modelSettingsId: input.modelSettingsId, userId: user.id });
      res.status(201);
      return runRecord(db, runId, service.live);
    },
  }),
  defineRoute({
    method: "get",
    path: "/api/runs",
    access: signedIn(markets.unscoped, fitRoles),
    handler: ({ req, db, runs: service }): Promise<Run[]> => {
      const dataset = typeof req.query.dataset === "string" && req.query.dataset !== "" ? req.query.dataset : undefined;
      return listRunRecords(db, service.live, { statuses: statusesOf(req.query.status), datasetVersionId: dataset });
    },
  }),
  // Before /api/runs/:runId, so "current" is not read as an id.
  defineRoute({
    method: "get",
    path: "/api/runs/current",
    access: signedIn(markets.filtered),
    handler: async ({ db, scope, runs: service }): Promise<RunResults> => {
      const id = await currentRunId(db);
      if (!id) throw new NotFound("No fit has been published yet");
      return runResultsFor(db, await runRecord(db, id, service.live), scope);
    },
  }),
  defineRoute({
    method: "get",
    path: "/api/runs/:runId",
    access: signedIn(markets.unscoped, fitRoles),
    handler: ({ req, db, runs: service }): Promise<Run> => runRecord(db, String(req.params.runId), service.live),
  }),
  defineRoute({
    method: "get",
    path: "/api/runs/:runId/results",
    access: signedIn(markets.filtered, fitRoles),
    handler: async ({ req, db, scope, runs: service }): Promise<RunResults> =>
      runResultsFor(db, await runRecord(db, String(req.params.runId), service.live), scope),
  }),
  defineRoute({
    method: "get",
    path: "/api/runs/:runId/report",
    access: signedIn(markets.unscoped, fitRoles),
    handler: async ({ req, db, runs: service }): Promise<RunReport> => runReportOf(db, await runRecord(db, String(req.params.runId), service.live)),
  }),
  defineRoute({
    method: "get",
    path: "/api/runs/:runId/events",
    access: signedIn(markets.unscoped, fitRoles),
    handler: async ({ req, res, db, runs: service }) => {
      const runId = String(req.params.runId);
      const first = await runRecord(db, runId, service.live);
      res.status(200);
      res.setHeader("Content-Type", "text/event-stream; charset=utf-8");
      res.setHeader("Cache-Control", "no-cache, no-transform");
      res.setHeader("Connection", "keep-alive");
      res.setHeader("X-Accel-Buffering", "no");
      res.flushHeaders();
      const send = (event: RunEvent) => res.write(`event: ${event.type}\ndata: ${JSON.stringify(event)}\n\n`);
      const ended = (run: Run) => run.status !== "queued" && run.status !== "running";

      send({ type: "run", run: first });
      if (ended(first)) {
        send({ type: "end", run: first });
        res.end();
        return;
      }
      await new Promise<void>((resolve) => {
        const heartbeat = setInterval(() => res.write(": still here\n\n"), HEARTBEAT_MS);
        const stop = () => {
          clearInterval(heartbeat);
          off();
          resolve();
        };
        const off = service.subscribe(runId, (event) => {
          if (event.type === "progress") send({ type: "progress", progress: event.progress });
          else if (event.finished) {
            send({ type: "end", run: event.run });
            res.end();
            stop();
          } else send({ type: "run", run: event.run });
        });
        req.on("close", stop);
        // The run may have ended between the first read and the subscription.
        void runRecord(db, runId, service.live).then((now) => {
          if (ended(now) && !res.writableEnded) {
            send({ type: "end", run: now });
            res.end();
            stop();
          }
        });
      });
    },
  }),
  defineRoute({
    method: "post",
    path: "/api/runs/:runId/cancel",
    access: signedIn(markets.unscoped, fitRoles),
    handler: ({ req, user, runs: service }): Promise<Run> => service.cancel(String(req.params.runId), user.id),
  }),
  defineRoute({
    method: "post",
    path: "/api/runs/:runId/restart",
    access: signedIn(markets.unscoped, fitRoles),
    handler: async ({ req, res, db, user, runs: service }): Promise<Run> => {
      const runId = await service.restart(String(req.params.runId), user.id);
      res.status(201);
      return runRecord(db, runId, service.live);
    },
  }),
  defineRoute({
    method: "post",
    path: "/api/runs/:runId/publish",
    access: signedIn(markets.unscoped, fitRoles),
    handler: async ({ req, db, user, runs: service, dashboards, mailer, config }): Promise<Run> => {
      const runId = String(req.params.runId);
      const input = publishRunInput.parse(req.body ?? {});
      await publishRun(db, runId, user.id, input.reason);
      // Market managers are told, each about their own markets only.
      await notifyRunPublished(db, mailer, runId, appBaseUrl(config, req), req.log);
      // The dashboards read the new current run: compute its numbers before the first request.
      dashboards.warm(runId);
      return runRecord(db, runId, service.live);
    },
  }),
];
