import { createEngine } from '../src/engine';
import { oursSheet } from './workloads/builtin';
const o = oursSheet();
const ho = createEngine({ Sheet1: o.rows });
const load = { sheet: 0, row: 6, col: 2 };
let x = 0;
const n = +(process.argv[2] || 2000);
for (let i = 0; i < 200; i++) { ho.setCellContents(load, [[3.3 * (1 + 1e-6 * i)]]); }
const t0 = performance.now();
for (let i = 0; i < n; i++) { ho.setCellContents(load, [[3.3 * (1 + 1e-6 * (i+1000))]]); x += ho.getCellValue({ sheet: 0, row: 0, col: 6 }) as number; }
console.log(((performance.now() - t0) / n * 1000).toFixed(1), 'us per recalc', x);
