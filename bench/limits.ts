/**
 * Times every size bound of src/core/limits.ts at (or just under) its limit, through invoke() as a cell
 * calls it, warm, best of 5, to check that one cell stays within about 50 ms. Plain Node, not jest (jest's
 * sandbox is several times slower). Run from the project folder: npm run bench:limits
 */
import { invoke } from '../src/functions/invoke';
import { FUNCTION_BY_NAME } from '../src/functions/table';
import { LIMITS } from '../src/core/limits';

const call = (name: string, args: unknown[]) => invoke(FUNCTION_BY_NAME.get(name)!, args);
function time(label: string, name: string, args: unknown[], reps = 5): void {
  call(name, args); // warm up
  let best = Infinity;
  let r = call(name, args);
  for (let i = 0; i < reps; i++) {
    const t0 = performance.now();
    r = call(name, args);
    best = Math.min(best, performance.now() - t0);
  }
  console.log(`${label.padEnd(58)} ${best.toFixed(1).padStart(7)} ms  ${r.ok ? 'ok' : `${r.code} ${r.message.slice(0, 60)}`}`);
}
const col = (n: number, f: (k: number) => unknown) => Array.from({ length: n }, (_, k) => [f(k)]);
function ladder(rows: number, toleranced = 0): unknown[][] {
  const step = [['series', 'L', 1e-6], ['+', 'R', 0.01], ['shunt', 'C', 1e-6], ['+', 'R', 0.02]];
  return Array.from({ length: rows }, (_, k) => [...step[k % 4], ...(k < toleranced ? [5] : [])]);
}
const pulse = (N: number) => (call('PULSE', [0, 12, 0.4, 100e3, N, 1e-7, 2e-7, 1e-6]) as { value: unknown }).value;
const flat = (N: number) => Array.from({ length: N + 1 }, (_, n) => [n, n * 50, 1, 0]);
const N = LIMITS.harmonics;

time(`PULSE N = ${N}`, 'PULSE', [0, 12, 0.4, 100e3, N, 1e-7, 2e-7, 1e-6]);
time(`PEAK of a pulse, N = ${N}`, 'PEAK', [pulse(N)]);
time(`PEAK of equal amplitudes (an impulse train), N = ${N}`, 'PEAK', [flat(N)]);
time(`TRACE ${LIMITS.tracePoints} points × 997.3 periods, N = ${N}`, 'TRACE', [pulse(N), LIMITS.tracePoints, 997.3]);
time(`SAMPLED ${LIMITS.samples} samples`, 'SAMPLED', [col(LIMITS.samples, Math.sin), 1e6, N]);
time(`SAMPLED ${LIMITS.samples - 1} samples (odd length)`, 'SAMPLED', [col(LIMITS.samples - 1, Math.sin), 1e6, N]);
const K = 1500;
time(`PWL ${K} points × ${LIMITS.pwlWork / K - 1} harmonics (pwlWork)`, 'PWL', [col(K, (k) => k * 1e-6), col(K, Math.sin), LIMITS.pwlWork / K - 1, 2e-3]);
const rows = LIMITS.ladderRows;
time(`IMPEDANCE ${rows} rows × ${LIMITS.networkWork / rows} frequencies (networkWork)`, 'IMPEDANCE', [ladder(rows), col(LIMITS.networkWork / rows, (k) => 10 + 100 * k)]);
time(`RESPONSE ${rows} rows × N = ${LIMITS.networkWork / rows - 1}, element current`, 'RESPONSE', [pulse(LIMITS.networkWork / rows - 1), ladder(rows), 'I', 3]);
time(`STRESS 5 rows × N = ${LIMITS.stressWork / 5 - 1} (stressWork)`, 'STRESS', [pulse(LIMITS.stressWork / 5 - 1), ladder(5)]);
time(`STRESS ${rows} rows × N = ${Math.floor(LIMITS.stressWork / rows) - 1}`, 'STRESS', [pulse(Math.floor(LIMITS.stressWork / rows) - 1), ladder(rows)]);
time('SPREAD pp, 12 rows, 16 corners, N = 780 (spreadWork)', 'SPREAD', [pulse(780), ladder(12, 4), 'pp']);
time('SPREAD rms, 20 rows, 256 corners, N = 190', 'SPREAD', [pulse(190), ladder(20, 8), 'rms']);
time('SPREAD rms, 4 rows, 9000 trials, N = 10', 'SPREAD', [pulse(10), ladder(4, 4), 'rms', null, null, 9000]);
time(`COMBINE 4 spectra of up to ${N} harmonics (combineRows)`, 'COMBINE', [1, 2, 3, 4].map((k) => (call('PULSE', [0, 1, 0.3, 1000 * k, Math.floor(N / k) - 1]) as { value: unknown }).value));
time('IMPEDANCE of a whole column (2^20 cells, 3 numbers)', 'IMPEDANCE', [ladder(4), col(LIMITS.rangeCells, (k) => (k < 3 ? 1000 : null))]);
