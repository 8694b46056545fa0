// The demo's design and true parameters as one JSON document, committed beside the
// demo as demo-truth.json (written by write-demo-truth.ts, checked by a test).
import { demoDesign, demoRealDifference, demoSeed } from "./demo-design";
import { simulateDemo } from "./simulate-demo";

export function demoTruthDocument() {
  const { truth } = simulateDemo(demoSeed);
  return {
    description:
      "True parameters of the demo portfolio (names as in the model specification). Data and truth are regenerated from the seed by simulateDemo(); this file is written by `pnpm --filter @tributary/api demo:truth`.",
    seed: demoSeed,
    design: demoDesign,
    realDifference: demoRealDifference,
    channels: truth.channels,
    cells: truth.cells,
  };
}
