import { LADDER } from './fixtures';
import { LadderSolver, makePortBatch } from '../src/core/network';
const K = +(process.argv[2] || 2000);
const solver = new LadderSolver(LADDER);
const w = new Float64Array(K); for (let k = 0; k < K; k++) w[k] = 2 * Math.PI * 250e3 * (k + 1);
const b = makePortBatch(K);
const reps = Math.round(4e6 / K);
for (let i = 0; i < reps / 4; i++) solver.portsBatch(w, K, 'voltage', b);
const t0 = performance.now();
for (let i = 0; i < reps; i++) solver.portsBatch(w, K, 'voltage', b);
const ns = (performance.now() - t0) * 1e6 / (reps * K);
console.log('portsBatch', ns.toFixed(1), 'ns/harmonic', b.fRe[7]);
// plain complex multiply-add loop
const n = 1024; const ar = new Float64Array(n).fill(0.5), ai = new Float64Array(n).fill(0.25), br = new Float64Array(n).fill(0.9), bi = new Float64Array(n).fill(-0.1), yr = new Float64Array(n), yi = new Float64Array(n);
function cma() { for (let i = 0; i < n; i++) { const xr = ar[i], xi = ai[i], zr = br[i], zi = bi[i]; yr[i] += xr * zr - xi * zi; yi[i] += xr * zi + xi * zr; } }
for (let i = 0; i < 2000; i++) cma();
const t1 = performance.now(); const r2 = 20000;
for (let i = 0; i < r2; i++) cma();
console.log('cma', ((performance.now() - t1) * 1e6 / (r2 * n)).toFixed(2), 'ns/cma', yr[3]);
