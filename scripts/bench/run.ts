/**
 * Runs every benchmark and fails when one misses its budget. `npm run bench` for the full size
 * (minutes, thresholds enforced); `--smoke` for a small run that only shows the code still works.
 * A bench is a module exporting a `Bench`; add it to the list below.
 */
import os from "node:os";
import { pickerBench } from "./picker.ts";
import { forageBench } from "../bench-forage.ts";

export type BenchSize = "full" | "smoke";

export interface BenchOutcome {
  /** What to print: figures a person reads and copies into DEVELOPERS.md. */
  lines: string[];
  /** Budgets missed; any of them makes the run exit non-zero. */
  failures: string[];
}

export interface Bench {
  name: string;
  run(size: BenchSize): BenchOutcome | Promise<BenchOutcome>;
}

const benches: Bench[] = [pickerBench, forageBench];

const size: BenchSize = process.argv.includes("--smoke") ? "smoke" : "full";
// Latencies mean little without the machine and what else was running on it.
const load = () => os.loadavg().map((n) => n.toFixed(2)).join(" ");
console.log(`${os.cpus().length} cores, ${Math.round(os.totalmem() / 2 ** 30)} GiB, node ${process.version}; load average ${load()}\n`);
let failed = false;
for (const bench of benches) {
  console.log(`## ${bench.name} (${size})`);
  const { lines, failures } = await bench.run(size);
  for (const line of lines) console.log(line);
  for (const failure of failures) console.error(`FAIL: ${failure}`);
  if (failures.length > 0) failed = true;
  console.log("");
}
console.log(`load average after: ${load()}`);
process.exitCode = failed ? 1 : 0;
