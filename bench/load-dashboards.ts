// Load on the dashboards while a fit runs: the real server on a temporary data directory
// with the demo workspace and its first fit published (DEMO_FIT=quick), the five demo
// people (one of every role) signed in, a fit of the demo data with the default settings
// started through the API as the analyst, then 50 concurrent clients (autocannon) on the
// dashboards' read routes for 30 s, each person reading what their role may see. The
// fit's status is polled throughout to prove it ran the whole time. Prints JSON: latency
// percentiles, requests/s, errors and non-2xx answers, overall and per route, the
// server's CPU by thread, and the machine's load and cores. Target: p95 under 100 ms,
// no errors. The temporary data directory is removed at the end (also on Ctrl-C).
// Run: pnpm bench:load [--connections 50] [--seconds 30] [--baseline] [--fit-chain-threads n]
//      [--log-level info] [--profile-server dir] [--out bench/results/load-dashboards.json]
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { createRequire } from "node:module";
import { availableParallelism, cpus, loadavg, tmpdir, totalmem } from "node:os";
import { join } from "node:path";
import type { EventEmitter } from "node:events";
import { parseArgs } from "node:util";
import { datasetVersionSchema, runResultsSchema, runSchema } from "@tributary/contracts";
import { ApiClient, pollUntil, spawnServer } from "../apps/api/src/backup/server-process";
import { demoUsers } from "../apps/api/src/demo/users";

// autocannon is a dev dependency of the API package; it ships no types, so the little used here is declared.
interface CannonRequest {
  readonly method: "GET";
  readonly path: string;
  readonly headers: Record<string, string>;
}
interface CannonResult {
  readonly requests: { readonly total: number; readonly average: number };
  readonly errors: number;
  readonly timeouts: number;
  readonly non2xx: number;
  readonly duration: number;
}
type CannonInstance = EventEmitter & PromiseLike<CannonResult>;
type Autocannon = (options: { url: string; connections: number; duration: number; timeout: number; requests: CannonRequest[] }) => CannonInstance;
const autocannon = createRequire(new URL("../apps/api/package.json", import.meta.url))("autocannon") as Autocannon;

const { values: args } = parseArgs({
  options: {
    connections: { type: "string", default: "50" },
    seconds: { type: "string", default: "30" },
    baseline: { type: "boolean", default: false },
    out: { type: "string" },
    "log-level": { type: "string", default: "info" },
    /** The server's FIT_CHAIN_THREADS (default: the server's own default, one per core). */
    "fit-chain-threads": { type: "string" },
    /** A directory for a CPU profile of the server's main thread (written when it stops). */
    "profile-server": { type: "string" },
  },
});
const connections = Number(args.connections);
const seconds = Number(args.seconds);
const TARGET_P95_MS = 100;
const REQUEST_TIMEOUT_S = 10;
if (!Number.isInteger(connections) || connections < 1) throw new Error(`--connections must be a positive whole number, got ${args.connections}`);
if (!Number.isFinite(seconds) || seconds <= 0) throw new Error(`--seconds must be a positive number, got ${args.seconds}`);
const fitChainThreads = args["fit-chain-threads"];
if (fitChainThreads !== undefined && !/^[1-9]\d*$/.test(fitChainThreads)) throw new Error(`--fit-chain-threads must be a positive whole number, got ${fitChainThreads}`);

const percentile = (sorted: readonly number[], p: number) => (sorted.length === 0 ? null : sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))]!);
const round = (x: number | null, digits = 1) => (x === null ? null : Number(x.toFixed(digits)));

/** CPU seconds and nice value of each thread of a process (Linux /proc), by thread id. */
function threadCpuSeconds(pid: number): Map<number, { name: string; seconds: number; nice: number }> {
  const ticks = 100; // USER_HZ, 100 on Linux
  const result = new Map<number, { name: string; seconds: number; nice: number }>();
  let tasks: string[] = [];
  try {
    tasks = readdirSync(`/proc/${pid}/task`);
  } catch {
    return result;
  }
  for (const tid of tasks) {
    try {
      const stat = readFileSync(`/proc/${pid}/task/${tid}/stat`, "utf8");
      const name = stat.slice(stat.indexOf("(") + 1, stat.lastIndexOf(")"));
      const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
      result.set(Number(tid), { name, seconds: (Number(fields[11]) + Number(fields[12])) / ticks, nice: Number(fields[16]) });
    } catch {
      // The thread ended meanwhile.
    }
  }
  return result;
}

interface RouteLoad {
  readonly name: string;
  readonly requests: CannonRequest[];
}

interface FitWatch {
  /** Polls of the fit's status during the phase (one a second) and how many found it running. */
  readonly polls: number;
  readonly running: number;
  readonly runningThroughout: boolean;
  readonly progress: { readonly before: number | null; readonly after: number | null };
}

interface PhaseReport {
  readonly fit: FitWatch | null;
  readonly seconds: number;
  readonly connections: number;
  readonly overall: Record<string, unknown>;
  readonly routes: Record<string, Record<string, unknown>>;
  /** Cores used by this process (the load generator) during the phase. */
  readonly loadGeneratorCores: number;
  readonly serverCpu: { readonly mainThreadCores: number; readonly allThreadsCores: number; readonly busiestOtherThreads: { name: string; cores: number; nice: number }[] };
  readonly loadAverage: { readonly before: number; readonly after: number };
}

function summary(latencies: number[], counts: { total: number; errors: number; timeouts: number; non2xx: number }, wallSeconds: number) {
  const sorted = latencies.sort((a, b) => a - b);
  return {
    requests: counts.total,
    requestsPerSecond: round(counts.total / wallSeconds),
    latencyMs: { p50: round(percentile(sorted, 50)), p95: round(percentile(sorted, 95)), p99: round(percentile(sorted, 99)), max: round(sorted.at(-1) ?? null) },
    errors: counts.errors,
    timeouts: counts.timeouts,
    non2xx: counts.non2xx,
  };
}

/** The fit's progress while it runs (null once it is not running). */
type FitProgressProbe = () => Promise<number | null>;

async function drive(baseUrl: string, routes: readonly RouteLoad[], serverPid: number, fitProgress: FitProgressProbe | null): Promise<PhaseReport> {
  // Connections shared out over the routes, the first ones getting the remainder.
  const share = routes.map((_, i) => Math.floor(connections / routes.length) + (i < connections % routes.length ? 1 : 0));
  const latencies = new Map(routes.map((r) => [r.name, [] as number[]]));
  const loadBefore = loadavg()[0]!;
  const progressBefore = fitProgress ? await fitProgress() : null;
  const cpuBefore = threadCpuSeconds(serverPid);
  const generatorBefore = process.cpuUsage();
  // The fit's status once a second while the clients run, to show it ran throughout.
  const polls: boolean[] = [];
  let polling = fitProgress !== null;
  const poller = (async () => {
    while (polling && fitProgress) {
      await new Promise((resolve) => setTimeout(resolve, 1000));
      if (!polling) break;
      polls.push((await fitProgress().catch(() => null)) !== null);
    }
  })();
  const started = performance.now();
  const results = await Promise.all(
    routes.map((route, i) => {
      const instance = autocannon({ url: baseUrl, connections: share[i]!, duration: seconds, timeout: REQUEST_TIMEOUT_S, requests: route.requests });
      const list = latencies.get(route.name)!;
      instance.on("response", (_client: unknown, _status: number, _bytes: number, responseTime: number) => list.push(responseTime));
      return instance;
    }),
  );
  const wall = (performance.now() - started) / 1000;
  const cpuAfter = threadCpuSeconds(serverPid);
  const generator = process.cpuUsage(generatorBefore);
  polling = false;
  await poller;
  const progressAfter = fitProgress ? await fitProgress() : null;
  const busy = [...cpuAfter].map(([tid, after]) => ({ tid, name: after.name, nice: after.nice, cores: (after.seconds - (cpuBefore.get(tid)?.seconds ?? 0)) / wall }));
  const main = busy.find((t) => t.tid === serverPid)?.cores ?? 0;

  const routeReports: Record<string, Record<string, unknown>> = {};
  const all: number[] = [];
  const totals = { total: 0, errors: 0, timeouts: 0, non2xx: 0 };
  routes.forEach((route, i) => {
    const result = results[i]!;
    const list = latencies.get(route.name)!;
    all.push(...list);
    const counts = { total: result.requests.total, errors: result.errors, timeouts: result.timeouts, non2xx: result.non2xx };
    totals.total += counts.total;
    totals.errors += counts.errors;
    totals.timeouts += counts.timeouts;
    totals.non2xx += counts.non2xx;
    routeReports[route.name] = { connections: share[i], ...summary(list, counts, wall) };
  });
  const running = polls.filter(Boolean).length;
  return {
    fit: fitProgress
      ? {
          polls: polls.length,
          running,
          runningThroughout: progressBefore !== null && progressAfter !== null && polls.length > 0 && running === polls.length,
          progress: { before: round(progressBefore, 3), after: round(progressAfter, 3) },
        }
      : null,
    seconds: round(wall, 1)!,
    connections,
    overall: summary(all, totals, wall),
    routes: routeReports,
    loadGeneratorCores: round((generator.user + generator.system) / 1e6 / wall, 2)!,
    serverCpu: {
      mainThreadCores: round(main, 2)!,
      allThreadsCores: round(busy.reduce((sum, t) => sum + t.cores, 0), 2)!,
      busiestOtherThreads: busy
        .filter((t) => t.tid !== serverPid)
        .sort((a, b) => b.cores - a.cores)
        .slice(0, 4)
        .map((t) => ({ name: t.name, cores: round(t.cores, 2)!, nice: t.nice })),
    },
    loadAverage: { before: round(loadBefore, 2)!, after: round(loadavg()[0]!, 2)! },
  };
}

const roles = [
  { key: "admin", user: demoUsers.admin },
  { key: "portfolioLead", user: demoUsers.portfolioLead },
  { key: "analyst", user: demoUsers.analyst },
  { key: "veltriaManager", user: demoUsers.veltriaManager },
  { key: "southManager", user: demoUsers.southManager },
] as const;
/** Roles that may read the Runs list and the Pooling review. */
const reviewRoles = new Set<string>(["admin", "analyst"]);

const loadAtStart = loadavg();
const dataDir = mkdtempSync(join(tmpdir(), "tributary-bench-load-"));
const server = spawnServer({
  dataDir,
  env: { DEMO_FIT: "quick", ...(fitChainThreads ? { FIT_CHAIN_THREADS: fitChainThreads } : {}) },
  logLevel: args["log-level"],
  nodeOptions: args["profile-server"] ? ["--cpu-prof", `--cpu-prof-dir=${args["profile-server"]}`] : [],
});
let cleanedUp: Promise<void> | null = null;
const cleanUp = () =>
  (cleanedUp ??= (async () => {
    await server.stop();
    rmSync(dataDir, { recursive: true, force: true });
  })());
// Ctrl-C or a kill: stop the server and remove its data directory before leaving.
for (const name of ["SIGINT", "SIGTERM"] as const) {
  process.once(name, () => {
    console.error(`${name}: stopping the server and removing ${dataDir}`);
    void cleanUp().finally(() => process.exit(130));
  });
}

try {
  const baseUrl = await server.ready;
  const admin = await ApiClient.signIn(baseUrl, demoUsers.admin);
  const publishStarted = performance.now();
  await pollUntil("the demo's first fit to be published", async () => ((await admin.request("GET", "/api/runs/current")).status === 200 ? true : undefined), 30 * 60_000, 2000);
  const firstFitSeconds = (performance.now() - publishStarted) / 1000;

  // Every role signed in; each one's own cells (a manager's markets only) for the channel sheets.
  const people = await Promise.all(
    roles.map(async (role) => {
      const client = await ApiClient.signIn(baseUrl, role.user);
      const current = runResultsSchema.parse(await client.json("GET", "/api/runs/current"));
      const sheets = current.cells.filter((c) => c.hasSpend).map((c) => `/api/dashboards/channel-sheet/${c.cellId}/${c.channel}`);
      return { key: role.key, headers: { cookie: client.cookieHeader() }, sheets, channels: current.channels.map((c) => c.channel) };
    }),
  );
  const reviewers = people.filter((p) => reviewRoles.has(p.key));
  const every = (paths: (person: (typeof people)[number]) => string[], who = people): CannonRequest[] =>
    who.flatMap((person) => paths(person).map((path) => ({ method: "GET" as const, path, headers: person.headers })));
  // What the dashboard screens read (the route table's /api/dashboards/* JSON routes and the flags they list),
  // plus the Runs list. CSV exports are downloads, not screen loads, and are left out; so is /api/runs/current,
  // the results API for scripts, which no screen reads.
  const routes: RouteLoad[] = [
    { name: "portfolio map", requests: every((p) => ["/api/dashboards/portfolio-map", ...p.channels.map((c) => `/api/dashboards/portfolio-map?channel=${c}`)]) },
    { name: "brand comparison", requests: every(() => ["/api/dashboards/brand-comparison"]) },
    { name: "market desk", requests: every(() => ["/api/dashboards/market-desk"]) },
    { name: "channel sheets", requests: every((p) => p.sheets) },
    { name: "pooling review", requests: every(() => ["/api/dashboards/pooling-review"], reviewers) },
    { name: "flags", requests: every(() => ["/api/flags?status=all", "/api/flags?status=active"]) },
    { name: "dashboard status", requests: every(() => ["/api/dashboards/status"]) },
    { name: "runs list", requests: every(() => ["/api/runs"], reviewers) },
  ];
  // Every request once, so first-request computations (channel sheets) are not what is measured;
  // then once more, one at a time, for each route's size and unloaded time.
  const warmStarted = performance.now();
  const single: Record<string, { requests: number; meanKb: number; meanMs: number }> = {};
  for (let pass = 0; pass < 2; pass++) {
    for (const route of routes) {
      let bytes = 0;
      let ms = 0;
      for (const request of route.requests) {
        const t0 = performance.now();
        const response = await fetch(`${baseUrl}${request.path}`, { headers: request.headers });
        const body = await response.arrayBuffer();
        ms += performance.now() - t0;
        bytes += body.byteLength;
        if (response.status !== 200) throw new Error(`${request.path} answered ${response.status} in the warm-up: ${Buffer.from(body).toString().slice(0, 300)}`);
      }
      if (pass === 1) single[route.name] = { requests: route.requests.length, meanKb: round(bytes / 1024 / route.requests.length)!, meanMs: round(ms / route.requests.length, 2)! };
    }
  }
  const warmUpSeconds = (performance.now() - warmStarted) / 1000;

  const analyst = await ApiClient.signIn(baseUrl, demoUsers.analyst);
  const pid = server.child.pid!;
  const baseline = args.baseline ? await drive(baseUrl, routes, pid, null) : null;

  // A fit with the default settings (4 chains × (1000 + 1000), no-pooling comparison) of the demo data, started as a user would.
  const demo = (await analyst.json<unknown[]>("GET", "/api/datasets")).map((v) => datasetVersionSchema.parse(v)).find((v) => v.fileName === "quillfern-weekly.csv");
  if (!demo) throw new Error("the demo dataset is missing");
  const settings = await analyst.json<{ id: string; settings: Record<string, unknown> }>("POST", "/api/model-settings", { datasetVersionId: demo.id, seed: 5 }, 201);
  const run = runSchema.parse(await analyst.json("POST", "/api/runs", { modelSettingsId: settings.id }, 201));
  const fitProgress: FitProgressProbe = async () => {
    const now = runSchema.parse(await analyst.json("GET", `/api/runs/${run.id}`));
    return now.status === "running" ? (now.progress?.fraction ?? 0) : null;
  };
  await pollUntil("the fit to start", async () => ((await fitProgress()) !== null ? true : undefined), 10 * 60_000, 250);
  // Past the chain threads' start-up (they load the sampler's code), so the load meets the sampling itself.
  await pollUntil("the fit's chains to report progress", async () => (((await fitProgress()) ?? 0) > 0 ? true : undefined), 10 * 60_000, 250);
  const underFit = await drive(baseUrl, routes, pid, fitProgress);
  const fitStillRunning = (await fitProgress()) !== null;

  const overall = underFit.overall as { latencyMs: { p95: number | null }; errors: number; timeouts: number; non2xx: number };
  const p95 = overall.latencyMs.p95;
  // Quiet: the 1-minute load average under half the cores before this benchmark started anything.
  const quiet = loadAtStart[0]! < 0.5 * availableParallelism();
  const phaseLoads = [underFit, ...(baseline ? [baseline] : [])].flatMap((phase) => [phase.loadAverage.before, phase.loadAverage.after]);
  const notes = [
    "The load generator (autocannon, in this process) runs on the same machine as the server and the fit, and shares its cores.",
    "Closed loop: each client sends its next request when the previous one is answered, so latency ≈ connections ÷ throughput.",
    ...(quiet
      ? []
      : [
          `The machine was busy with other work: 1-minute load average ${round(loadAtStart[0]!, 2)} on ${availableParallelism()} cores before the benchmark started, ${round(Math.min(...phaseLoads), 2)} to ${round(Math.max(...phaseLoads), 2)} during the load (of which the fit's threads, the server and the clients make about 3 to 4). The server's main thread got only the share of a core shown in serverCpu.mainThreadCores, so the latencies are worse than on a quiet machine.`,
        ]),
  ];
  const report = {
    what: `${connections} concurrent clients for ${seconds} s on the dashboards' read routes (GET; the five demo people, one of every role, each reading what their role and markets allow) of the real server with the demo workspace, while a fit of the demo data with the default settings runs`,
    target: { p95Ms: TARGET_P95_MS, errors: 0, met: p95 !== null && p95 < TARGET_P95_MS && overall.errors === 0 && overall.timeouts === 0 && overall.non2xx === 0 },
    machine: {
      cores: availableParallelism(),
      cpu: cpus()[0]?.model ?? "unknown",
      memoryGb: round(totalmem() / 2 ** 30, 1),
      node: process.version,
      loadAverageAtStart: loadAtStart.map((x) => round(x, 2)),
      quiet,
    },
    settings: { connections, seconds, baselineWithoutFit: args.baseline, requestTimeoutSeconds: REQUEST_TIMEOUT_S, serverLogLevel: args["log-level"], fitChainThreads: fitChainThreads ? Number(fitChainThreads) : "server default (one per core)" },
    server: {
      fit: { runId: run.id, settings: { chains: settings.settings.chains, warmup: settings.settings.warmup, draws: settings.settings.draws, unpooled: settings.settings.unpooled }, stillRunningAtEnd: fitStillRunning },
      firstFitPublishedAfterSeconds: round(firstFitSeconds, 1),
      warmUp: { distinctRequests: routes.reduce((n, r) => n + r.requests.length, 0), seconds: round(warmUpSeconds, 1) },
    },
    oneAtATimeWithoutFit: single,
    notes,
    underFit,
    ...(baseline ? { baselineWithoutFit: baseline } : {}),
  };
  const json = JSON.stringify(report, null, 2);
  console.log(json);
  if (args.out) writeFileSync(args.out, `${json}\n`);
} finally {
  await cleanUp();
}
