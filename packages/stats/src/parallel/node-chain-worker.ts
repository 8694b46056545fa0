// Node worker-thread entry: runs chains sent by node-worker-pool through the shared endpoint.
import { parentPort } from "node:worker_threads";
import type { ModelSpec } from "../model/density-model";
import type { ChainProgress, ChainResult, SamplerSettings } from "../sampler/sampler-settings";
import { samplerEndpoint } from "./sampler-endpoint";

export interface RunChainMessage {
  type: "run";
  spec: ModelSpec;
  settings: SamplerSettings;
  chain: number;
  stopFlag: Int32Array;
}

export type WorkerReply =
  | { type: "progress"; progress: ChainProgress }
  | { type: "done"; result: ChainResult }
  | { type: "error"; chain: number; message: string };

const port = parentPort;
if (port === null) throw new Error("node-chain-worker must run in a worker thread");

port.on("message", (message: RunChainMessage) => {
  try {
    const result = samplerEndpoint.sampleChain(
      message.spec,
      message.settings,
      message.chain,
      (progress) => port.postMessage({ type: "progress", progress } satisfies WorkerReply),
      message.stopFlag,
    );
    const arrays = [result.draws, result.treeDepth, result.leapfrogSteps, result.divergent, result.energy, result.acceptStat, result.logDensity, result.inverseMetric];
    const buffers = arrays.flatMap((a) => (a === undefined ? [] : [a.buffer as ArrayBuffer]));
    port.postMessage({ type: "done", result } satisfies WorkerReply, buffers);
  } catch (error) {
    port.postMessage({ type: "error", chain: message.chain, message: error instanceof Error ? error.message : String(error) } satisfies WorkerReply);
  }
});
