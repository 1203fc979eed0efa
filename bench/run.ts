/**
 * `npm run bench [-- name…]`: each workload prints one line
 *   BENCH <name> ours_ms=<median> baseline_ms=<median> ratio=<baseline/ours>
 * plus INFO lines (values compared, accuracy, memory). Plain node (ts-node transpiles, nothing else), never
 * inside jest; no test asserts a time. DEVELOPERS.md explains each workload and how to read the figures.
 */
import * as os from 'os';
import { runCell } from './workloads/cell';
import { runBuiltin } from './workloads/builtin';
import { runSweep } from './workloads/sweep';
import { runPeak } from './workloads/peak';
import { runFft } from './workloads/fft';
import { runCeiling } from './workloads/ceiling';

// The sweep last: its 10,000-row workbook leaves the most garbage behind.
const WORKLOADS: Record<string, (log: (s: string) => void) => void> = {
  cell: runCell,
  builtin: runBuiltin,
  peak: runPeak,
  fft: runFft,
  ceiling: runCeiling,
  sweep: runSweep,
};

function main(): void {
  const wanted = process.argv.slice(2);
  const names = wanted.length ? wanted : Object.keys(WORKLOADS);
  const cpu = os.cpus()[0]?.model ?? 'unknown CPU';
  const load = os.loadavg().map((x) => x.toFixed(2)).join(' ');
  console.log(`INFO machine cpus=${os.cpus().length} model="${cpu}" node=${process.version} load_average=${load}`);
  if (typeof (global as { gc?: unknown }).gc !== 'function') {
    console.log('INFO run with node --expose-gc (npm run bench does) for exact heap figures');
  }
  for (const name of names) {
    const run = WORKLOADS[name];
    if (!run) throw new Error(`unknown workload ${name}; known: ${Object.keys(WORKLOADS).join(', ')}`);
    run((s) => console.log(s));
  }
}

main();
