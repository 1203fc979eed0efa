/**
 * `sweep`: a 10,000-row design-case workbook — each row one full analysis, =HC.RMS(HC.RESPONSE(spectrum,
 * ladder, , , values)) with that row's values override — recalculated in the engine after the source's duty
 * cycle changes (so every row recomputes), against the same 10,000 analyses called directly on the core
 * (response + rms on a parsed ladder). The ratio is core time / engine time: the engine's overhead.
 */
import { performance } from 'perf_hooks';
import { RawCellContent } from 'hyperformula';
import { createEngine } from '../../src/engine';
import { response } from '../../src/core/response';
import { rms } from '../../src/core/measures';
import { pulse } from '../../src/core/waveforms';
import { consume, LADDER, LADDER_ROWS, PULSE_ARGS, rng } from '../fixtures';
import { benchLine, pair } from '../timing';

const ROWS = 10_000;
const HARMONICS = 200;

/** One values override per row: every part somewhere inside its tolerance. */
function designCases(): Float64Array[] {
  const rand = rng(7);
  const out: Float64Array[] = [];
  for (let r = 0; r < ROWS; r++) {
    const v = new Float64Array(LADDER.rows);
    for (let i = 0; i < LADDER.rows; i++) v[i] = LADDER.value[i] * (1 + (LADDER.tolerance[i] / 100) * (2 * rand() - 1));
    out.push(v);
  }
  return out;
}

const gcNow = (): void => (global as { gc?: () => void }).gc?.();
const mb = (x: number): string => (x / 2 ** 20).toFixed(0);

export function runSweep(log: (s: string) => void): void {
  const cases = designCases();
  const p = PULSE_ARGS;
  const inputs: RawCellContent[][] = LADDER_ROWS.map((r) => [...r]);
  inputs[0][7] = p.duty;
  while (inputs.length < 9) inputs.push([]);
  inputs.push([`=HC.PULSE(${p.low}, ${p.high}, H1, ${p.f0}, ${HARMONICS}, ${p.rise}, ${p.fall})`]);
  const spec = `Inputs!$A$10:$D$${10 + HARMONICS}`;
  const ladder = `Inputs!$A$1:$E$${LADDER.rows + 1}`;
  const sweep: RawCellContent[][] = cases.map((v, r) => [...v, `=HC.RMS(HC.RESPONSE(${spec}, ${ladder}, , , A${r + 1}:F${r + 1}))`]);

  gcNow();
  const heap0 = process.memoryUsage().heapUsed;
  const t0 = performance.now();
  const hf = createEngine({ Inputs: inputs, Sweep: sweep });
  const buildMs = performance.now() - t0;
  const inputsId = hf.getSheetId('Inputs')!;
  const sweepId = hf.getSheetId('Sweep')!;
  const duty = { sheet: inputsId, row: 0, col: 7 };
  const col = LADDER.rows;

  let k = 0;
  const dutyAt = (i: number): number => p.duty * (1 + 1e-4 * (i % 1000)); // new each time: no cached answer
  let lastDuty: number = p.duty;
  const engineRun = (): number => {
    lastDuty = dutyAt(++k);
    hf.setCellContents(duty, [[lastDuty]]);
    return hf.getCellValue({ sheet: sweepId, row: ROWS - 1, col }) as number;
  };
  const coreRun = (d: number): Float64Array => {
    const s = pulse(p.low, p.high, d, p.f0, HARMONICS, p.rise, p.fall, 0);
    const out = new Float64Array(ROWS);
    for (let r = 0; r < ROWS; r++) out[r] = rms(response(s, LADDER, { values: cases[r] }));
    return out;
  };

  engineRun();
  gcNow();
  const heap = process.memoryUsage();
  // Same duty on both sides, then every row compared.
  const core = coreRun(lastDuty);
  let worst = 0;
  for (let r = 0; r < ROWS; r++) {
    const v = hf.getCellValue({ sheet: sweepId, row: r, col });
    if (typeof v !== 'number') throw new Error(`sweep row ${r + 1}: ${JSON.stringify(v)}`);
    worst = Math.max(worst, Math.abs(v - core[r]) / core[r]);
  }
  log(`INFO sweep rows=${ROWS} harmonics=${HARMONICS} build_ms=${buildMs.toFixed(0)} engine_vs_core_max_rel_diff=${worst.toExponential(2)}`);
  log(`INFO sweep heap_used_mb=${mb(heap.heapUsed)} (engine and workbook ${mb(heap.heapUsed - heap0)}) rss_mb=${mb(heap.rss)} target<300`);
  let kc = 0;
  const r = pair(() => consume(engineRun()), () => consume(coreRun(dutyAt(++kc))[ROWS - 1]), { reps: 5, inner: 1 });
  // Here "ours" is the engine and the baseline the core: ratio = core / engine (1 would be no overhead).
  log(benchLine('sweep', r));
}
