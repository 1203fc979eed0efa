/**
 * `ceiling`: how close the ladder kernel comes to what this machine does in plain JavaScript. Ours: the
 * batched ladder pass (LadderSolver.portsBatch, behind RESPONSE, TRANSFER and IMPEDANCE) over 2,000
 * frequencies of the 6-element demo ladder. Baseline: a plain loop y += a·b of complex multiply-adds over
 * Float64Arrays held in cache, timed for the same count of complex multiply-adds.
 * Work is counted in complex multiply-adds (CMA = 8 flops: 4 multiplications, 4 additions): the kernel's
 * floating-point operations (+, −, ×, ÷ each one flop; comparisons and |x| not counted) divided by 8.
 * ratio = baseline time / ours = the kernel's CMA rate / the plain loop's CMA rate.
 */
import { ACROSS, LadderTable, L, C, R, SHUNT } from '../../src/core/ladder';
import { LadderSolver, makePortBatch } from '../../src/core/network';
import { consume, LADDER } from '../fixtures';
import { benchLine, pair } from '../timing';

const FREQS = 2000;

/**
 * Flops per frequency of portsBatch (its backward cascade; see network.ts), for the branches up to the last
 * shunt, which are all it evaluates; + − × ÷ one each. 1/ω once per frequency. A branch of series elements only
 * is R + j(ω·L − S/ω) from sums formed once per call: 7 (ω·L, S·(1/ω), the difference, 2 additions for the
 * scale, 2 multiplications for the snap thresholds). A branch with a `||` row is folded row by row: element
 * impedance L 1 (ω·v), C 2 (ω·v, 1/x), R 0; a `+` resistor 1; a `+` reactance 5 (scale 2, sum 1, thresholds 2);
 * a `||` fold 25 (snapped complex sum 7, reciprocal 6, two complex products 12). A reciprocal is 6 (|z|² 3,
 * 1/x, two products). Then per branch, backwards: a shunt adds V/Z to I, 19 (reciprocal 6, product 6, snapped
 * complex sum 7), or 9 for a shunt of one resistor (V·(1/R): 2, the sum 7; 1/R is formed once per call); the
 * last shunt, where the cascade starts from V = 1 and I = 0, only the reciprocal, 6 (0 for one resistor); a
 * series branch adds Z·I to V, 13 (product 6, snapped sum 7); at the source one reciprocal and one product, 12.
 */
export function kernelFlops(t: LadderTable): number {
  let last = -1;
  for (let b = 0; b < t.branches; b++) if (t.role[t.branchStart[b]] === SHUNT) last = b;
  const impedance = (i: number): number => (t.kind[i] === L ? 1 : t.kind[i] === C ? 2 : 0);
  let flops = 12 + 1;
  for (let b = 0; b <= last; b++) {
    const first = t.branchStart[b];
    const end = t.branchStart[b + 1];
    if (t.role[first] === SHUNT && t.kind[first] === R && end === first + 1) {
      flops += b === last ? 0 : 9; // at the far end I is just 1/R
      continue;
    }
    let across = false;
    for (let i = first + 1; i < end; i++) if (t.role[i] === ACROSS) across = true;
    if (!across) flops += 7;
    else {
      flops += impedance(first);
      for (let i = first + 1; i < end; i++) {
        if (t.role[i] === ACROSS) flops += impedance(i) + 25;
        else flops += t.kind[i] === R ? 1 : impedance(i) + 5;
      }
    }
    flops += t.role[first] === SHUNT ? (b === last ? 6 : 19) : 13; // at the far end I is just 1/Z
  }
  return flops;
}

/**
 * The plain loop, in the fastest form found on this machine: module-level arrays of a constant length, so
 * that the JIT drops every bounds check (~2.5× faster than the same loop over arrays passed as arguments,
 * shown on an INFO line). One pass is PLAIN_N complex multiply-adds.
 */
const PLAIN_N = 2048;
const AR = new Float64Array(PLAIN_N).map((_, i) => 0.5 + 1e-4 * i);
const AI = new Float64Array(PLAIN_N).map((_, i) => 0.25 - 1e-4 * i);
const BR = new Float64Array(PLAIN_N).fill(0.999);
const BI = new Float64Array(PLAIN_N).fill(-0.001);
const YR = new Float64Array(PLAIN_N);
const YI = new Float64Array(PLAIN_N);

function plainPass(): void {
  for (let i = 0; i < PLAIN_N; i++) {
    const xr = AR[i], xi = AI[i], zr = BR[i], zi = BI[i];
    YR[i] += xr * zr - xi * zi;
    YI[i] += xr * zi + xi * zr;
  }
}

/** The same loop over arrays given as arguments (bounds checked). */
function argumentPass(ar: Float64Array, ai: Float64Array, br: Float64Array, bi: Float64Array, yr: Float64Array, yi: Float64Array): void {
  for (let i = 0; i < yr.length; i++) {
    const xr = ar[i], xi = ai[i], zr = br[i], zi = bi[i];
    yr[i] += xr * zr - xi * zi;
    yi[i] += xr * zi + xi * zr;
  }
}

export function runCeiling(log: (s: string) => void): void {
  const solver = new LadderSolver(LADDER);
  const w = new Float64Array(FREQS);
  for (let k = 0; k < FREQS; k++) w[k] = 2 * Math.PI * 250e3 * (k + 1);
  const batch = makePortBatch(FREQS);
  const flops = kernelFlops(LADDER);
  const cmas = (flops / 8) * FREQS;
  const passes = Math.max(1, Math.round(cmas / PLAIN_N));
  const plain = (): void => {
    for (let p = 0; p < passes; p++) plainPass();
    consume(YR[7]);
  };
  const copies = [AR, AI, BR, BI, YR, YI].map((a) => Float64Array.from(a));
  const viaArguments = (): void => {
    for (let p = 0; p < passes; p++) argumentPass(copies[0], copies[1], copies[2], copies[3], copies[4], copies[5]);
    consume(copies[4][7]);
  };
  solver.portsBatch(w, FREQS, 'voltage', batch);
  const fast = batch.ok.reduce((a, b) => a + b, 0);
  const kernel = (): void => {
    solver.portsBatch(w, FREQS, 'voltage', batch);
    consume(batch.fRe[5]);
  };
  // the plain loops did passes·PLAIN_N CMAs; scale them to exactly the kernel's count
  const scale = cmas / (passes * PLAIN_N);
  const alt = pair(kernel, viaArguments, { reps: 9 });
  const r = pair(kernel, plain, { reps: 21 });
  const scaled = { oursMs: r.oursMs, baselineMs: r.baselineMs * scale, ratio: (r.baselineMs * scale) / r.oursMs };
  const rate = (ms: number): string => (cmas / (ms / 1e3) / 1e9).toFixed(2);
  log(`INFO ceiling ladder rows=${LADDER.rows} freqs=${FREQS} (fast pass at ${fast}) flops_per_freq=${flops} CMA_per_freq=${(flops / 8).toFixed(2)}`);
  log(`INFO ceiling GCMA/s kernel=${rate(scaled.oursMs)} plain_loop=${rate(scaled.baselineMs)} plain_loop_over_arguments=${rate(alt.baselineMs * scale)} (ratio against it ${((alt.baselineMs * scale) / alt.oursMs).toFixed(2)})`);
  log(benchLine('ceiling', scaled));
}
