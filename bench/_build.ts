import { performance } from 'perf_hooks';
import { RawCellContent } from 'hyperformula';
import { createEngine } from '../src/engine';
import { LADDER, LADDER_ROWS } from './fixtures';
const ROWS = +(process.argv[2] || 2000);
const inputs: RawCellContent[][] = LADDER_ROWS.map((r) => [...r]);
inputs[0][7] = 0.4;
while (inputs.length < 9) inputs.push([]);
inputs.push([`=HC.PULSE(0, 12, H1, 250000, 200, 2e-8, 2e-8)`]);
const sweep: RawCellContent[][] = [];
for (let r = 0; r < ROWS; r++) sweep.push([...LADDER.value.map((v) => v * (1 + 0.1 * Math.random())), `=HC.RMS(HC.RESPONSE(Inputs!$A$10:$D$210, Inputs!$A$1:$E$7, , , A${r + 1}:F${r + 1}))`]);
const t0 = performance.now();
const hf = createEngine({ Inputs: inputs, Sweep: sweep });
console.log('build', (performance.now() - t0).toFixed(0), 'ms', hf.getCellValue({ sheet: 1, row: 0, col: 6 }));
const reps = +(process.argv[3] || 0);
for (let i = 0; i < reps; i++) {
  const t1 = performance.now();
  const c1 = process.cpuUsage();
  hf.setCellContents({ sheet: 0, row: 0, col: 7 }, [[0.4 + 0.001 * (i + 1)]]);
  const c2 = process.cpuUsage(c1);
  console.log('recalc', (performance.now() - t1).toFixed(0), 'ms wall', ((c2.user + c2.system) / 1000).toFixed(0), 'ms cpu', hf.getCellValue({ sheet: 1, row: ROWS - 1, col: 6 }));
}
