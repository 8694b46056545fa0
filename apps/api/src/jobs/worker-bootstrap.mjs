// Main script of a job's worker thread. Node loads a worker's main script before any
// loader flag could take effect there, so this plain module registers tsx itself and
// then imports the TypeScript job module named in workerData.entry.
import { workerData } from "node:worker_threads";
import { register } from "tsx/esm/api";

register();
await import(workerData.entry);
