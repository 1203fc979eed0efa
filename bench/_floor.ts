import { createEngine } from '../src/engine';
import { oursSheet } from './workloads/builtin';
const o = oursSheet();
for (const f of ['=SUM(A10:D210)+SUM(A1:C7)', '=HC.MEAN(A10:D210)+SUM(A1:C7)']) {
o.rows[0][6] = f;
const ho = createEngine({ Sheet1: o.rows });
const load = { sheet: 0, row: 6, col: 2 };
let x = 0;
const n = 20000;
for (let i = 0; i < 2000; i++) { ho.setCellContents(load, [[3.3 * (1 + 1e-6 * i)]]); }
const t0 = performance.now();
for (let i = 0; i < n; i++) { ho.setCellContents(load, [[3.3 * (1 + 1e-6 * (i+1000))]]); x += ho.getCellValue({ sheet: 0, row: 0, col: 6 }) as number; }
console.log(f, ((performance.now() - t0) / n * 1000).toFixed(1), 'us per recalc', x);
}
