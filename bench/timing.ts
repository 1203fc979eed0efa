/**
 * Paired timing: both sides run in the same process, warmed up, then interleaved (the order alternates each
 * repetition) so that drift in clock speed or garbage collection affects both alike. Each side's figure is the
 * median over repetitions of the time per call.
 */
import { performance } from 'perf_hooks';

export interface PairOptions {
  /** Repetitions per side after warm-up (each is one sample). */
  reps?: number;
  /** Calls per sample, so that a sample lasts long enough to time (default: calibrated to ~sampleMs). */
  inner?: number;
  /** Target duration of one sample when `inner` is calibrated. */
  sampleMs?: number;
  /** Warm-up calls per side (default: one sample's worth). */
  warmup?: number;
  /**
   * Idle milliseconds before each sample (default 0): background work one side leaves behind (concurrent
   * marking and sweeping of its heap, on the process's shared helper threads) then ends before the other
   * side's sample instead of competing with it for the CPU.
   */
  gapMs?: number;
  /**
   * Milliseconds each side runs before its sample size is calibrated (default: one sample's). An engine edit
   * takes thousands of calls to reach its steady speed (the JIT compiles the engine's paths in tiers).
   */
  warmMs?: number;
}

export interface PairResult {
  oursMs: number;
  baselineMs: number;
  ratio: number;
}

export function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : 0.5 * (s[m - 1] + s[m]);
}

/**
 * A side of a comparison: makes `n` calls and returns the milliseconds they took. Local functions are wrapped
 * by `local`; a side in a worker thread (sheet-worker.ts) times itself.
 */
export type Runner = (n: number) => number;

const gcMinor = (global as { gc?: (o: { type: 'minor' }) => void }).gc;

/**
 * A local function as a Runner. With --expose-gc (npm run bench) the young generation is emptied before each
 * sample, untimed, so that neither side pays for scavenging what the other side's last sample left behind. (A
 * full collection would also shrink the young generation, slowing the sample that follows.)
 */
export function local(fn: () => unknown): Runner {
  return (n: number): number => {
    gcMinor?.({ type: 'minor' });
    const t0 = performance.now();
    for (let i = 0; i < n; i++) fn();
    return performance.now() - t0;
  };
}

/** Calls per sample so that one sample takes about `sampleMs` (at least 1). */
function calibrate(run: Runner, sampleMs: number): number {
  let n = 1;
  for (;;) {
    const dt = run(n);
    if (dt >= sampleMs / 4 || n >= 1 << 20) return Math.max(1, Math.round((n * sampleMs) / Math.max(dt, 1e-3)));
    n *= 4;
  }
}

/**
 * Run both sides for about ms milliseconds each, alternating runs of up to about `slice` ms, so that neither
 * sits idle for long meanwhile (an idle V8 heap gets shrunk, and the side then starts its samples slowly).
 */
function warmBoth(a: Runner, b: Runner, ms: number, slice: number): void {
  const state = [a, b].map((run) => ({ run, spent: 0, n: 1 }));
  while (state.some((x) => x.spent < ms)) {
    for (const x of state) {
      if (x.spent >= ms) continue;
      const dt = x.run(x.n);
      x.spent += dt;
      if (dt < slice / 2) x.n = Math.min(2 * x.n, 1 << 20);
    }
  }
}

/** Median ms per call of `ours` and `baseline`, interleaved; ratio = baseline / ours (higher is better). */
export function pair(ours: () => unknown, baseline: () => unknown, opts: PairOptions = {}): PairResult {
  return pairRunners(local(ours), local(baseline), opts);
}

/** pair() for two Runners. */
export function pairRunners(ours: Runner, baseline: Runner, opts: PairOptions = {}): PairResult {
  const reps = opts.reps ?? 15;
  const sampleMs = opts.sampleMs ?? 60;
  // Calibrated after a first warm-up: calls made while the code is still being compiled are many times slower,
  // and samples sized from them would be too short to average over garbage collection.
  if (opts.inner === undefined) warmBoth(ours, baseline, opts.warmMs ?? sampleMs, sampleMs);
  const innerO = opts.inner ?? calibrate(ours, sampleMs);
  const innerB = opts.inner ?? calibrate(baseline, sampleMs);
  const idle = new Int32Array(new SharedArrayBuffer(4));
  const sample = (run: Runner, inner: number): number => {
    if (opts.gapMs) Atomics.wait(idle, 0, 0, opts.gapMs);
    return run(inner) / inner;
  };
  const warm = opts.warmup ?? 1;
  for (let w = 0; w < warm; w++) {
    sample(ours, innerO);
    sample(baseline, innerB);
  }
  const o: number[] = [];
  const b: number[] = [];
  for (let r = 0; r < reps; r++) {
    if (r % 2 === 0) {
      o.push(sample(ours, innerO));
      b.push(sample(baseline, innerB));
    } else {
      b.push(sample(baseline, innerB));
      o.push(sample(ours, innerO));
    }
  }
  if (process.env.BENCH_SAMPLES) {
    const show = (xs: number[]): string => xs.map((x) => x.toPrecision(3)).join(' ');
    console.log(`INFO samples ours ${show(o)} | baseline ${show(b)} | calls per sample ${innerO} / ${innerB}`);
  }
  const oursMs = median(o);
  const baselineMs = median(b);
  return { oursMs, baselineMs, ratio: baselineMs / oursMs };
}

const fmt = (x: number): string => (x >= 100 ? x.toFixed(1) : x >= 1 ? x.toFixed(3) : x.toPrecision(3));

/** The one machine-readable line per workload. */
export function benchLine(name: string, r: PairResult): string {
  return `BENCH ${name} ours_ms=${fmt(r.oursMs)} baseline_ms=${fmt(r.baselineMs)} ratio=${r.ratio.toFixed(2)}`;
}
