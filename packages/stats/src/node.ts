// Node-only entry point (`@tributary/stats/node`): the worker-thread pool. Kept out of
// index.ts so that browser bundles of the package never see node: modules.
export { sampleChainsInWorkers, SamplerWorkerPool } from "./parallel/node-worker-pool";
export type { WorkerPoolHooks } from "./parallel/node-worker-pool";
