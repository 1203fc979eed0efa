/**
 * One sheet in a headless engine of its own, in a worker thread: its own JavaScript heap, as each sheet would
 * be in its own workbook, so that neither side of a comparison runs in the other's heap (a live 3,000-formula
 * workbook in the same heap made the garbage collector promote the other side's short-lived objects, about
 * 1.5× on a 50 µs recalculation). The worker times its own edits; the main thread only asks and waits.
 *
 * Protocol: the main thread writes f64[0] = the number of edits to make and f64[1] = the first edit's index,
 * sets ctrl[0] to RUN and posts a message; the worker answers with f64[2] = elapsed ms and f64[3] = the result
 * cell's value after the last edit, then sets ctrl[0] back to IDLE. ctrl[1] is 1 once the engine is built.
 */
import { performance } from 'perf_hooks';
import { Worker, isMainThread, parentPort, workerData } from 'worker_threads';
import type { RawCellContent, SimpleCellAddress } from 'hyperformula';

const IDLE = 0;
const RUN = 1;
const STOP = 2;

export interface SheetJob {
  rows: RawCellContent[][];
  /** The cell whose value changes at each edit, the value it holds at edit k: base · (1 + 1e-6 · (k mod 1e5)). */
  edit: SimpleCellAddress;
  base: number;
  result: SimpleCellAddress;
}

export interface RemoteSheet {
  /** Make `count` edits starting at edit index `from`; returns the worker's own elapsed ms for them. */
  run(count: number, from: number): number;
  /** The result cell's value after the last run. */
  value(): number;

  stop(): void;
}

/** Start a worker holding `job`'s sheet; returns when its engine is built. */
export function startSheet(job: SheetJob): RemoteSheet {
  const ctrl = new Int32Array(new SharedArrayBuffer(8));
  const f64 = new Float64Array(new SharedArrayBuffer(32));
  // The bench runs under ts-node; the worker loads this same file through it.
  const code = `require('ts-node/register/transpile-only'); require(${JSON.stringify(__filename)});`;
  const worker = new Worker(code, { eval: true, workerData: { job, ctrl, f64 } });
  worker.unref();
  while (Atomics.load(ctrl, 1) !== 1) Atomics.wait(ctrl, 1, 0, 100);
  return {
    run(count: number, from: number): number {
      f64[0] = count;
      f64[1] = from;
      Atomics.store(ctrl, 0, RUN);
      worker.postMessage(RUN);
      while (Atomics.load(ctrl, 0) === RUN) Atomics.wait(ctrl, 0, RUN);
      return f64[2];
    },
    value: () => f64[3],

    stop(): void {
      worker.postMessage(STOP);
    },
  };
}

function serve(): void {
  // Loaded here, not at the top: the main thread only needs startSheet.
  // eslint-disable-next-line @typescript-eslint/no-var-requires
  const { createEngine } = require('../src/engine') as typeof import('../src/engine');
  const { job, ctrl, f64 } = workerData as { job: SheetJob; ctrl: Int32Array; f64: Float64Array };
  const hf = createEngine({ Sheet1: job.rows });
  const gc = (global as { gc?: (o: { type: 'minor' }) => void }).gc;
  Atomics.store(ctrl, 1, 1);
  Atomics.notify(ctrl, 1);
  // Commands arrive as messages, so the worker's event loop turns between runs, as a host's does between
  // recalculations: tasks V8 posts (finishing a garbage collection, for one) run there, untimed.
  parentPort?.on('message', (cmd: number) => {
    if (cmd === STOP) {
      parentPort?.close();
      return;
    }
    const count = f64[0];
    const from = f64[1];
    gc?.({ type: 'minor' }); // each sample starts with an empty young generation (see timing.ts)
    let value = 0;
    const t0 = performance.now();
    for (let i = 0; i < count; i++) {
      const k = from + i;
      hf.setCellContents(job.edit, [[job.base * (1 + 1e-6 * (k % 100000))]]);
      value = hf.getCellValue(job.result) as number;
    }
    f64[2] = performance.now() - t0;
    f64[3] = value;
    Atomics.store(ctrl, 0, IDLE);
    Atomics.notify(ctrl, 0);
  });
}

if (!isMainThread && workerData?.job) serve();
