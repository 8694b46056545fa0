// Writes demo-truth.json beside this file: `pnpm --filter @tributary/api demo:truth`.
import { writeFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { demoTruthDocument } from "./demo-truth";

const target = fileURLToPath(new URL("./demo-truth.json", import.meta.url));
writeFileSync(target, `${JSON.stringify(demoTruthDocument(), null, 2)}\n`);
console.log(`Wrote ${target}`);
