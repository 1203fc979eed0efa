/**
 * `npm run bench [-- name…]`: each workload prints one line
 *   BENCH <name> ours_ms=<median> baseline_ms=<median> ratio=<baseline/ours>
 * plus INFO lines (values compared, accuracy, memory). Plain node, never inside jest; no test asserts a time.
 */
import * as os from 'os';
import { runCell } from './workloads/cell';
import { runBuiltin } from './workloads/builtin';
import { runSweep } from './workloads/sweep';
import { runPeak } from './workloads/peak';
import { runFft } from './workloads/fft';
import { runCeiling } from './workloads/ceiling';

const WORKLOADS: Record<string, (log: (s: string) => void) => void> = {
  cell: runCell,
  builtin: runBuiltin,
  sweep: runSweep,
  peak: runPeak,
  fft: runFft,
  ceiling: runCeiling,
};

function main(): void {
  const wanted = process.argv.slice(2);
  const names = wanted.length ? wanted : Object.keys(WORKLOADS);
  const cpu = os.cpus()[0]?.model ?? 'unknown CPU';
  console.log(`INFO machine cpus=${os.cpus().length} model="${cpu}" node=${process.version}`);
  for (const name of names) {
    const run = WORKLOADS[name];
    if (!run) throw new Error(`unknown workload ${name}; known: ${Object.keys(WORKLOADS).join(', ')}`);
    run((s) => console.log(s));
  }
}

main();
