// Main script of a sampler worker thread. Node loads a worker's main script before
// `--import tsx` can hook ES-module loading there, but tsx's require hook is active, so
// this plain CommonJS file loads the TypeScript entry with require.
const { workerData } = require("node:worker_threads");
require(workerData.entry);
