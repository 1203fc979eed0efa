import { numError, valueError } from './errors';
import { ACROSS, C, checkValues, L, LadderTable, PLUS, R, SHUNT } from './ladder';
import { LIMITS } from './limits';
import { formatEng } from './units';

/**
 * Phasor analysis of a ladder (DESIGN §2, §3 IMPEDANCE / TRANSFER / RESPONSE) at one frequency at a time,
 * without allocation: every impedance, voltage and current lives in a slot of one preallocated Float64Array.
 *
 * Ideal parts make some frequencies singular: at DC an inductor is a short and a capacitor an open, and a
 * loss-free resonance can land exactly on a frequency. Each quantity is therefore held as the leading part of
 * its expansion around the frequency asked for,
 *     x ≈ ε^k · (a₀ + a₁·ε),   a₀ ≠ 0,
 * with ε = jω at DC (so L → L·ε, C → (1/C)·ε⁻¹) and ε = ω − ω₀ elsewhere (a₁ = dZ/dω of each part).
 * Series and parallel combination then never divide by zero: orders add, the lower order wins a sum, and a sum
 * whose leading terms cancel (a resonance, to within SNAP) moves on to the next order. At the end a quantity
 * with k > 0 is 0, k = 0 is a₀, and k < 0 is unbounded; this is the limit f → f₀, so for instance two
 * capacitors in series share DC voltage inversely to C and two inductors in parallel share DC current
 * inversely to L. Ordinary frequencies, where nothing cancels, take a plain complex pass instead
 * (LadderSolver.fastBackward/fastForward) that gives the same numbers.
 */

/**
 * A component of a sum smaller than SNAP × the size of its two terms is set to 0: it is rounding noise, and where
 * both components vanish the sum is an exact cancellation (a loss-free resonance) handled by the next order.
 */
export const SNAP = 1e-13;

// Slot layout: order k, number of reliable terms t (1 or 2), a₀ (re, im), a₁ (re, im).
const SLOT = 6;
const K = 0;
const T = 1;
const A0R = 2;
const A0I = 3;
const A1R = 4;
const A1I = 5;
/** reg[LOST] is set when a sum cancelled in both carried terms (checked at the end of the backward pass). */
const LOST = 0;

/** Flags in Solution.bad and Solution.portBad. */
export const V_UNBOUNDED = 1;
export const I_UNBOUNDED = 2;

export type SourceKind = 'voltage' | 'current';

/**
 * One frequency's solution for a unit source (1 V or 1 A, phase 0), written by LadderSolver.solve.
 * Sign conventions: each element's current flows from the source side to the far side (series branches) or
 * from the node to ground (shunt branches), through `+` and `||` elements in the same sense as through their
 * branch; its voltage is the drop in that direction (v = Z·i). The source current flows out of the voltage
 * source into node 1; the source voltage is node 1 against ground.
 */
export interface Solution {
  readonly vRe: Float64Array;
  readonly vIm: Float64Array;
  readonly iRe: Float64Array;
  readonly iIm: Float64Array;
  /** Per row: V_UNBOUNDED and/or I_UNBOUNDED where that quantity has no finite value (its slots hold 0). */
  readonly bad: Uint8Array;
  /** [source re, source im, far re, far im]: source current (voltage source) or voltage (current source). */
  readonly port: Float64Array;
  /** [source, far end]: 1 where unbounded. */
  readonly portBad: Uint8Array;
}

/** Port quantities at many frequencies, written by LadderSolver.portsBatch; each array has one slot per frequency. */
export interface PortBatch {
  /** Source current (voltage source) or source voltage, i.e. the input impedance (current source). */
  readonly sRe: Float64Array;
  readonly sIm: Float64Array;
  /** Far-end voltage. */
  readonly fRe: Float64Array;
  readonly fIm: Float64Array;
  /** 1 where the slot holds the answer; 0 where `solve` must take that frequency. */
  readonly ok: Uint8Array;
}

export function makePortBatch(count: number): PortBatch {
  const f = new Float64Array(4 * count);
  return {
    sRe: f.subarray(0, count), sIm: f.subarray(count, 2 * count), fRe: f.subarray(2 * count, 3 * count),
    fIm: f.subarray(3 * count), ok: new Uint8Array(count),
  };
}

let sharedBatch: { w: Float64Array; batch: PortBatch } | undefined;

/**
 * Angular frequencies and a PortBatch of at least `count` slots, shared by the callers in this module and
 * response.ts (each reads its results before it returns, and none calls another meanwhile), so that a sweep
 * allocates nothing per call.
 */
export function batchBuffers(count: number): { w: Float64Array; batch: PortBatch } {
  if (!sharedBatch || sharedBatch.w.length < count) {
    const size = Math.max(count, 2 * (sharedBatch?.w.length ?? 0), 256);
    sharedBatch = { w: new Float64Array(size), batch: makePortBatch(size) };
  }
  return sharedBatch;
}

let sharedSolution: Solution | undefined;

/**
 * A Solution for `table`'s row count shared by callers that read it before calling anything else that uses it
 * (response.ts's harmonics left to solve()), so a response allocates none (each is an off-heap allocation).
 */
export function scratchSolution(table: LadderTable): Solution {
  if (!sharedSolution || sharedSolution.vRe.length !== table.rows) sharedSolution = makeSolution(table);
  return sharedSolution;
}

export function makeSolution(table: LadderTable): Solution {
  const n = table.rows;
  const f = new Float64Array(4 * n + 4); // one backing store (see LadderSolver)
  const u = new Uint8Array(n + 2);
  return {
    vRe: f.subarray(0, n), vIm: f.subarray(n, 2 * n), iRe: f.subarray(2 * n, 3 * n), iIm: f.subarray(3 * n, 4 * n),
    port: f.subarray(4 * n), bad: u.subarray(0, n), portBad: u.subarray(n),
  };
}

/** "DC" or "2 kHz", for messages. */
export function describeFrequency(f: number): string {
  if (f === 0) return 'DC (0 Hz)';
  return formatEng(f, 'Hz', 6).replace(/\.?0+(?= )/, '');
}

// ---- truncated-series arithmetic on slots of r (indices are slot offsets) ----

function setSlot(r: Float64Array, d: number, k: number, t: number, a0r: number, a0i: number, a1r: number, a1i: number): void {
  r[d + K] = k;
  r[d + T] = t;
  r[d + A0R] = a0r;
  r[d + A0I] = a0i;
  r[d + A1R] = a1r;
  r[d + A1I] = a1i;
}

function copy(r: Float64Array, d: number, x: number): void {
  for (let i = 0; i < SLOT; i++) r[d + i] = r[x + i];
}

function mul(r: Float64Array, d: number, x: number, y: number): void {
  const xr = r[x + A0R], xi = r[x + A0I], yr = r[y + A0R], yi = r[y + A0I];
  const t = Math.min(r[x + T], r[y + T]);
  if (t > 1) {
    const x1r = r[x + A1R], x1i = r[x + A1I], y1r = r[y + A1R], y1i = r[y + A1I];
    r[d + A1R] = xr * y1r - xi * y1i + x1r * yr - x1i * yi;
    r[d + A1I] = xr * y1i + xi * y1r + x1r * yi + x1i * yr;
  }
  r[d + K] = r[x + K] + r[y + K];
  r[d + T] = t;
  r[d + A0R] = xr * yr - xi * yi;
  r[d + A0I] = xr * yi + xi * yr;
}

/** d = 1/x (Smith's scaling, so huge or tiny parts do not overflow the squared modulus). */
function inv(r: Float64Array, d: number, x: number): void {
  const xr = r[x + A0R], xi = r[x + A0I];
  let ur: number, ui: number;
  if (Math.abs(xr) >= Math.abs(xi)) {
    if (xr === 0) throw numError('component values reach outside the floating-point range; scale the ladder values.');
    const q = xi / xr, s = 1 / (xr + xi * q);
    ur = s;
    ui = -q * s;
  } else {
    const q = xr / xi, s = 1 / (xr * q + xi);
    ur = q * s;
    ui = -s;
  }
  const t = r[x + T];
  if (t > 1) {
    // a₁ of 1/x is −x₁/x₀²
    const x1r = r[x + A1R], x1i = r[x + A1I];
    const sr = ur * ur - ui * ui, si = 2 * ur * ui;
    r[d + A1R] = -(x1r * sr - x1i * si);
    r[d + A1I] = -(x1r * si + x1i * sr);
  }
  r[d + K] = -r[x + K];
  r[d + T] = t;
  r[d + A0R] = ur;
  r[d + A0I] = ui;
}

function div(r: Float64Array, d: number, x: number, y: number, tmp: number): void {
  inv(r, tmp, y);
  mul(r, d, x, tmp);
}

/** A sum component that is rounding noise of a cancellation becomes an exact 0. */
function snap(s: number, scale: number): number {
  return Math.abs(s) <= SNAP * scale ? 0 : s;
}

function add(r: Float64Array, d: number, x: number, y: number): void {
  if (r[x + K] > r[y + K]) {
    const s = x;
    x = y;
    y = s;
  }
  const gap = r[y + K] - r[x + K];
  const tx = r[x + T], ty = r[y + T];
  if (gap >= 2) {
    copy(r, d, x);
    return;
  }
  const xr = r[x + A0R], xi = r[x + A0I], yr = r[y + A0R], yi = r[y + A0I];
  if (gap === 1) {
    const t = Math.min(tx, 1 + ty);
    if (t > 1) {
      const x1r = r[x + A1R], x1i = r[x + A1I];
      const scale = Math.abs(x1r) + Math.abs(x1i) + Math.abs(yr) + Math.abs(yi);
      r[d + A1R] = snap(x1r + yr, scale);
      r[d + A1I] = snap(x1i + yi, scale);
    }
    r[d + K] = r[x + K];
    r[d + T] = t;
    r[d + A0R] = xr;
    r[d + A0I] = xi;
    return;
  }
  const k = r[x + K];
  const t = Math.min(tx, ty);
  const scale0 = Math.abs(xr) + Math.abs(xi) + Math.abs(yr) + Math.abs(yi);
  const s0r = snap(xr + yr, scale0), s0i = snap(xi + yi, scale0);
  let s1r = 0, s1i = 0;
  if (t > 1) {
    const x1r = r[x + A1R], x1i = r[x + A1I], y1r = r[y + A1R], y1i = r[y + A1I];
    const scale1 = Math.abs(x1r) + Math.abs(x1i) + Math.abs(y1r) + Math.abs(y1i);
    s1r = snap(x1r + y1r, scale1);
    s1i = snap(x1i + y1i, scale1);
  }
  if (s0r !== 0 || s0i !== 0) {
    setSlot(r, d, k, t, s0r, s0i, s1r, s1i);
  } else if (t > 1 && (s1r !== 0 || s1i !== 0)) {
    setSlot(r, d, k + 1, 1, s1r, s1i, 0, 0); // the leading terms cancelled: the next order leads
  } else {
    r[LOST] = 1; // would need a third term; a harmless stand-in lets the pass finish before it throws
    setSlot(r, d, 0, 1, 1, 0, 0, 0);
  }
}

// ---- plain complex arithmetic for the fast path; results go to OUT (no allocation) ----

const OUT = new Float64Array(2);

/** OUT = a + b, snapped like `add`; false when it cancels to 0 (a resonance: the general path takes over). */
function csum(ar: number, ai: number, br: number, bi: number): boolean {
  const scale = Math.abs(ar) + Math.abs(ai) + Math.abs(br) + Math.abs(bi);
  const sr = snap(ar + br, scale), si = snap(ai + bi, scale);
  OUT[0] = sr;
  OUT[1] = si;
  return sr !== 0 || si !== 0;
}

/**
 * |a|² between these bounds: 1/a = conj(a)/|a|² takes one division and loses nothing to overflow or underflow
 * (the smaller square, where it underflows, is below the larger's last bit). Outside them the scaled form
 * (Smith's, as `inv` uses) takes two divisions. The batched pass (portsBatch) forms every reciprocal the same way.
 */
const RECIP_MIN = 1e-290;
const RECIP_MAX = 1e290;

/** OUT = 1/a; false for a = 0 (underflow). */
function crecip(ar: number, ai: number): boolean {
  const d = ar * ar + ai * ai;
  if (d > RECIP_MIN && d < RECIP_MAX) {
    const t = 1 / d;
    OUT[0] = ar * t;
    OUT[1] = -ai * t;
  } else if (Math.abs(ar) >= Math.abs(ai)) {
    if (ar === 0) return false;
    const q = ai / ar, s = 1 / (ar + ai * q);
    OUT[0] = s;
    OUT[1] = -q * s;
  } else {
    const q = ar / ai, s = 1 / (ar * q + ai);
    OUT[0] = q * s;
    OUT[1] = -s;
  }
  return true;
}

/** OUT = a / b. */
function cdiv(ar: number, ai: number, br: number, bi: number): boolean {
  if (!crecip(br, bi)) return false;
  const ur = OUT[0], ui = OUT[1];
  OUT[0] = ar * ur - ai * ui;
  OUT[1] = ar * ui + ai * ur;
  return true;
}

/** OUT = a·b / (a + b), in the order `parallel` uses. */
function cpar(ar: number, ai: number, br: number, bi: number): boolean {
  if (!csum(ar, ai, br, bi) || !crecip(OUT[0], OUT[1])) return false;
  const ur = OUT[0], ui = OUT[1];
  const pr = ar * br - ai * bi, pi = ar * bi + ai * br;
  OUT[0] = pr * ur - pi * ui;
  OUT[1] = pr * ui + pi * ur;
  return true;
}

let solverStore = new Float64Array(0);

/** The shared working store of LadderSolver (see its constructor), grown as needed. */
function solverMemory(size: number): Float64Array {
  if (solverStore.length < size) solverStore = new Float64Array(Math.max(size, 2 * solverStore.length, 1024));
  return solverStore;
}

let constants = { yConst: new Float64Array(16), lumped: new Float64Array(48) };

/** Scratch for portsBatch's per-branch constants, grown as needed. */
function branchConstants(branches: number): { yConst: Float64Array; lumped: Float64Array } {
  if (constants.yConst.length < branches) {
    const n = Math.max(branches, 2 * constants.yConst.length);
    constants = { yConst: new Float64Array(n), lumped: new Float64Array(3 * n) };
  }
  return constants;
}

/**
 * Evaluates one ladder at one frequency at a time. Construct once per table (it preallocates everything),
 * optionally `setValues` per design case, then call `impedanceAt` / `solve` per frequency, or `portsBatch`
 * for many frequencies at once. Working values live only within one such call: solvers share their working
 * memory, so nothing may rely on it between calls.
 *
 * Two paths give the same numbers: at f > 0 a plain complex pass runs first and hands over to the general
 * (expansion) pass only when a sum cancels exactly, i.e. at a loss-free resonance; DC always takes the
 * general pass.
 */
export class LadderSolver {
  readonly table: LadderTable;
  /** Index of the last shunt branch; −1 when the ladder has no path to ground at all. */
  readonly lastShunt: number;
  /** false forces the general pass everywhere (tests compare the two paths). */
  fast = true;
  private values: ArrayLike<number>;
  private readonly reg: Float64Array;
  // Slot bases of the general pass: element impedances, branch composites after each row, load impedances.
  private readonly zBase: number;
  private readonly wBase: number;
  private readonly lBase: number;
  private readonly tmp: number;
  // The fast pass's counterparts as plain complex arrays.
  private readonly zr: Float64Array;
  private readonly zi: Float64Array;
  private readonly wr: Float64Array;
  private readonly wi: Float64Array;
  private readonly lr: Float64Array;
  private readonly li: Float64Array;
  private readonly pair = new Float64Array(2);

  constructor(table: LadderTable, values?: ArrayLike<number>) {
    this.table = table;
    this.values = table.value;
    if (values) this.setValues(values);
    const n = table.rows;
    const b = table.branches;
    this.zBase = SLOT;
    this.wBase = this.zBase + n * SLOT;
    this.lBase = this.wBase + n * SLOT;
    this.tmp = this.lBase + b * SLOT;
    // Views into one shared store: each typed array above 64 bytes is a separate, slow allocation (and garbage
    // collection), and a solver's working values live only within one call of impedanceAt, solve or
    // portsBatch, so solvers can share it (calls never nest).
    const regLength = this.tmp + 8 * SLOT;
    const mem = solverMemory(regLength + 4 * n + 2 * b);
    this.reg = mem.subarray(0, regLength);
    let at = regLength;
    const take = (len: number): Float64Array => mem.subarray(at, (at += len));
    this.zr = take(n);
    this.zi = take(n);
    this.wr = take(n);
    this.wi = take(n);
    this.lr = take(b);
    this.li = take(b);
    let last = -1;
    for (let k = 0; k < b; k++) if (table.role[table.branchStart[k]] === SHUNT) last = k;
    this.lastShunt = last;
  }

  /** Replace the value column for the following evaluations (DESIGN §2 values override); undefined restores it. */
  setValues(values?: ArrayLike<number>): void {
    this.values = values ? checkValues(this.table, values) : this.table.value;
  }

  /**
   * Impedance seen by the source at frequency f (Hz) into out[0], out[1]; returns false (out = 0) when it is
   * unbounded (an open circuit: no path to ground, only capacitors at DC, or a loss-free parallel resonance).
   */
  impedanceAt(f: number, out: Float64Array): boolean {
    if (this.lastShunt < 0) {
      out[0] = out[1] = 0;
      return false;
    }
    if (f > 0 && this.fast && this.fastBackward(2 * Math.PI * f)) {
      out[0] = this.lr[0];
      out[1] = this.li[0];
      checkRange(out[0], out[1], f);
      return true;
    }
    this.backward(f);
    return this.extract(this.lBase, out, 0, f);
  }

  /**
   * Solve for a unit source at frequency f (Hz). With `elements` false only `port` and `portBad` are written
   * (cheaper, for the transfer function).
   */
  solve(f: number, source: SourceKind, out: Solution, elements = true): void {
    const currentSource = source === 'current';
    if (elements) {
      // Rows after the last shunt carry no current and drop no voltage; the passes write all others.
      const from = this.lastShunt < 0 ? 0 : this.table.branchStart[this.lastShunt + 1];
      out.vRe.fill(0, from);
      out.vIm.fill(0, from);
      out.iRe.fill(0, from);
      out.iIm.fill(0, from);
      out.bad.fill(0);
    }
    if (this.lastShunt < 0) return noPath(currentSource, out, elements);
    if (f > 0 && this.fast && this.fastBackward(2 * Math.PI * f) && this.fastForward(currentSource, out, elements, f)) return;
    this.backward(f);
    this.forward(f, currentSource, out, elements);
  }

  // ---- batched fast pass: many frequencies, port quantities only ----

  /**
   * Port quantities for a unit source at `count` angular frequencies w[k] > 0 (rad/s) in one pass, written to
   * `out` (see PortBatch), by the backward cascade: from a far-end voltage of 1 and no current beyond the last
   * shunt, each shunt branch adds its current V/Z and each series branch its drop Z·I, back to the source,
   * whose voltage and current then scale the far end and the source to a unit source. That is the same network
   * as `solve` solves by loads and a forward pass, with fewer divisions (three per frequency for an L-C-load
   * filter against seven) and nothing stored but the running V and I; the two agree to rounding
   * (test/batched-network.test.ts).
   * Where the plain pass does not hold (a sum that cancels, a zero divisor, a value outside the number range)
   * out.ok[k] is 0 and the caller solves that frequency with `solve`, which takes the general pass or reports
   * the error. Nothing here throws.
   */
  portsBatch(w: Float64Array, count: number, source: SourceKind, out: PortBatch): void {
    if (this.lastShunt < 0 || !this.fast) {
      out.ok.fill(0, 0, count);
      return;
    }
    // The reciprocals are written out where they are used rather than calling crecip: through its shared OUT
    // array this loop measured about 45 % slower.
    const { table, values } = this;
    const last = this.lastShunt;
    const ok = out.ok;
    const { sRe, sIm, fRe, fIm } = out;
    const starts = table.branchStart;
    const kinds = table.kind;
    const roles = table.role;
    const snapAt = SNAP;
    const current = source === 'current';
    // A shunt branch of one resistor (a load, a damping resistor) has the same admittance at every frequency.
    // A branch of elements in series only (no ||) is R + j(ω·L − S/ω) with its R, L and S = Σ 1/C summed once
    // per call: lumped[3b … 3b + 2], or NaN in lumped[3b] for a branch with a || row (folded row by row).
    const { yConst, lumped } = branchConstants(last + 1);
    for (let b = 0; b <= last; b++) {
      const first = starts[b];
      const end = starts[b + 1];
      yConst[b] = roles[first] === SHUNT && kinds[first] === R && end === first + 1 ? 1 / values[first] : 0;
      let rs = 0, ls = 0, ss = 0;
      for (let i = first; i < end; i++) {
        if (i > first && roles[i] === ACROSS) {
          rs = NaN;
          break;
        }
        const v = values[i];
        if (kinds[i] === R) rs += v;
        else if (kinds[i] === L) ls += v;
        else ss += 1 / v;
      }
      lumped[3 * b] = rs;
      lumped[3 * b + 1] = ls;
      lumped[3 * b + 2] = ss;
    }
    // Each frequency's cascade runs in registers, branch by branch from the last shunt (branches after it carry
    // no current and drop no voltage) back to the source; frequencies are independent, so their divisions overlap.
    for (let x = 0; x < count; x++) {
      const wk = w[x];
      // V and I on the far side of the branch being added, per volt at the far end.
      let vr = 1, vi = 0, ir = 0, ii = 0;
      let good = wk > 0;
      const invW = 1 / wk;
      for (let b = last; good && b >= 0; b--) {
        const first = starts[b];
        const end = starts[b + 1];
        const yc = yConst[b];
        if (b === last && yc !== 0) {
          // the first step from the far end: V = 1 and no current yet, so I = 1/R
          ir = yc;
          continue;
        }
        if (yc !== 0) {
          // I += V·(1/R)
          const xr = vr * yc, xi = vi * yc;
          const scale = Math.abs(xr) + Math.abs(xi) + Math.abs(ir) + Math.abs(ii);
          let sr = xr + ir;
          let si = xi + ii;
          if (Math.abs(sr) <= snapAt * scale) sr = 0;
          if (Math.abs(si) <= snapAt * scale) si = 0;
          if (sr === 0 && si === 0) {
            good = false;
            break;
          }
          ir = sr;
          ii = si;
          continue;
        }
        let zr: number, zi: number;
        const rs = lumped[3 * b];
        if (rs === rs) {
          // series elements only: R + j(ω·L − S/ω); a passive real part cannot cancel, the reactances can
          const xl = wk * lumped[3 * b + 1], xc = invW * lumped[3 * b + 2];
          const scale = rs + xl + xc;
          zr = rs;
          zi = xl - xc;
          if (rs <= snapAt * scale) zr = 0;
          if (Math.abs(zi) <= snapAt * scale) zi = 0;
          if (zr === 0 && zi === 0) {
            good = false; // a loss-free series resonance: solve() takes this frequency
            break;
          }
        } else {
          // The branch impedance, folded row by row as fastBackward folds it.
          const v0 = values[first];
          const kind0 = kinds[first];
          zr = kind0 === R ? v0 : 0;
          zi = kind0 === L ? wk * v0 : kind0 === C ? -(1 / (wk * v0)) : 0;
          for (let i = first + 1; i < end; i++) {
            const v = values[i];
            const kind = kinds[i];
            const across = roles[i] === ACROSS;
            if (!across) {
              // A passive branch's real part is ≥ 0 (to rounding), so adding a resistor cannot cancel the sum:
              // it is added as it is. Adding a reactance is snapped as csum snaps it (a loss-free resonance).
              if (kind === R) {
                zr += v;
                continue;
              }
              const x = kind === L ? wk * v : -(1 / (wk * v));
              const scale = Math.abs(zr) + Math.abs(zi) + Math.abs(x);
              let si = zi + x;
              if (Math.abs(zr) <= snapAt * scale) zr = 0;
              if (Math.abs(si) <= snapAt * scale) si = 0;
              if (zr === 0 && si === 0) {
                good = false; // a cancellation: solve() takes this frequency
                break;
              }
              zi = si;
              continue;
            }
            const a = kind === R ? v : 0;
            const bb = kind === L ? wk * v : kind === C ? -(1 / (wk * v)) : 0;
            const scale = Math.abs(zr) + Math.abs(zi) + Math.abs(a) + Math.abs(bb);
            let sr = zr + a;
            let si = zi + bb;
            if (Math.abs(sr) <= snapAt * scale) sr = 0;
            if (Math.abs(si) <= snapAt * scale) si = 0;
            if (sr === 0 && si === 0) {
              good = false; // a cancellation: solve() takes this frequency
              break;
            }
            // z ∥ a = z·a / (z + a)
            let ur: number, ui: number;
            const d = sr * sr + si * si;
            if (d > RECIP_MIN && d < RECIP_MAX) {
              const t = 1 / d;
              ur = sr * t;
              ui = -si * t;
            } else if (Math.abs(sr) >= Math.abs(si)) {
              const q = si / sr, t = 1 / (sr + si * q);
              ur = t;
              ui = -q * t;
            } else {
              const q = sr / si, t = 1 / (sr * q + si);
              ur = q * t;
              ui = -t;
            }
            const qr = zr * a - zi * bb, qi = zr * bb + zi * a;
            zr = qr * ur - qi * ui;
            zi = qr * ui + qi * ur;
          }
        }
        if (!good) break;
        let xr: number, xi: number, yr: number, yi: number; // the running sum's terms: y + x
        if (roles[first] === SHUNT) {
          // the branch current V/Z joins the current flowing on towards the far end
          if (zr === 0 && zi === 0) {
            good = false;
            break;
          }
          let ur: number, ui: number;
          const d = zr * zr + zi * zi;
          if (d > RECIP_MIN && d < RECIP_MAX) {
            const t = 1 / d;
            ur = zr * t;
            ui = -zi * t;
          } else if (Math.abs(zr) >= Math.abs(zi)) {
            const q = zi / zr, t = 1 / (zr + zi * q);
            ur = t;
            ui = -q * t;
          } else {
            const q = zr / zi, t = 1 / (zr * q + zi);
            ur = q * t;
            ui = -t;
          }
          if (b === last) {
            // the first step from the far end: V = 1 and no current yet, so I = 1/Z
            ir = ur;
            ii = ui;
            continue;
          }
          xr = vr * ur - vi * ui;
          xi = vr * ui + vi * ur;
          yr = ir;
          yi = ii;
        } else {
          // the series branch drops Z·I on top of the voltage after it
          xr = ir * zr - ii * zi;
          xi = ir * zi + ii * zr;
          yr = vr;
          yi = vi;
        }
        const scale = Math.abs(xr) + Math.abs(xi) + Math.abs(yr) + Math.abs(yi);
        let sr = xr + yr;
        let si = xi + yi;
        if (Math.abs(sr) <= snapAt * scale) sr = 0;
        if (Math.abs(si) <= snapAt * scale) si = 0;
        if (sr === 0 && si === 0) {
          good = false; // a resonance through the ladder: the general pass expands around it
          break;
        }
        if (roles[first] === SHUNT) {
          ir = sr;
          ii = si;
        } else {
          vr = sr;
          vi = si;
        }
      }
      // At the source: a unit voltage source divides by V, a unit current source by I.
      const pr = current ? ir : vr, pi = current ? ii : vi;
      if (!good || (pr === 0 && pi === 0)) {
        ok[x] = 0;
        continue;
      }
      let ur: number, ui: number;
      const d = pr * pr + pi * pi;
      if (d > RECIP_MIN && d < RECIP_MAX) {
        const t = 1 / d;
        ur = pr * t;
        ui = -pi * t;
      } else if (Math.abs(pr) >= Math.abs(pi)) {
        const q = pi / pr, t = 1 / (pr + pi * q);
        ur = t;
        ui = -q * t;
      } else {
        const q = pr / pi, t = 1 / (pr * q + pi);
        ur = q * t;
        ui = -t;
      }
      // the other port quantity: the source current (voltage source) or the source voltage (current source)
      const qr = current ? vr : ir, qi = current ? vi : ii;
      const sr = qr * ur - qi * ui, si = qr * ui + qi * ur;
      sRe[x] = sr;
      sIm[x] = si;
      fRe[x] = ur;
      fIm[x] = ui;
      ok[x] = Math.abs(sr) < Infinity && Math.abs(si) < Infinity && Math.abs(ur) < Infinity && Math.abs(ui) < Infinity ? 1 : 0;
    }
  }

  // ---- fast pass (f > 0, nothing cancels) ----

  private fastBackward(w: number): boolean {
    const { table, values, zr, zi, wr, wi, lr, li } = this;
    for (let i = 0; i < table.rows; i++) {
      const v = values[i];
      const kind = table.kind[i];
      const a = kind === R ? v : 0;
      const b = kind === L ? w * v : kind === C ? -(1 / (w * v)) : 0;
      zr[i] = a;
      zi[i] = b;
      const role = table.role[i];
      if (role === PLUS || role === ACROSS) {
        if (!(role === PLUS ? csum(wr[i - 1], wi[i - 1], a, b) : cpar(wr[i - 1], wi[i - 1], a, b))) return false;
        wr[i] = OUT[0];
        wi[i] = OUT[1];
      } else {
        wr[i] = a;
        wi[i] = b;
      }
    }
    const last = this.lastShunt;
    const starts = table.branchStart;
    lr[last] = wr[starts[last + 1] - 1];
    li[last] = wi[starts[last + 1] - 1];
    for (let b = last - 1; b >= 0; b--) {
      const e = starts[b + 1] - 1;
      const ok = table.role[starts[b]] === SHUNT ? cpar(wr[e], wi[e], lr[b + 1], li[b + 1]) : csum(wr[e], wi[e], lr[b + 1], li[b + 1]);
      if (!ok) return false;
      lr[b] = OUT[0];
      li[b] = OUT[1];
    }
    return true;
  }

  private fastForward(currentSource: boolean, out: Solution, elements: boolean, f: number): boolean {
    const { table, wr, wi, lr, li } = this;
    const last = this.lastShunt;
    const starts = table.branchStart;
    let vr: number, vi: number, ir: number, ii: number;
    if (currentSource) {
      ir = 1;
      ii = 0;
      vr = lr[0];
      vi = li[0];
      out.port[0] = vr;
      out.port[1] = vi;
    } else {
      if (!crecip(lr[0], li[0])) return false;
      vr = 1;
      vi = 0;
      ir = OUT[0];
      ii = OUT[1];
      out.port[0] = ir;
      out.port[1] = ii;
    }
    for (let b = 0; b <= last; b++) {
      const e = starts[b + 1] - 1;
      const zbr = wr[e], zbi = wi[e];
      let bvr: number, bvi: number, bir: number, bii: number;
      if (table.role[starts[b]] === SHUNT) {
        bvr = vr;
        bvi = vi;
        if (!cdiv(vr, vi, zbr, zbi)) return false;
        bir = OUT[0];
        bii = OUT[1];
        if (b < last) {
          if (!cdiv(vr, vi, lr[b + 1], li[b + 1])) return false;
          ir = OUT[0];
          ii = OUT[1];
        }
      } else {
        bir = ir;
        bii = ii;
        bvr = ir * zbr - ii * zbi;
        bvi = ir * zbi + ii * zbr;
        const nr = lr[b + 1], ni = li[b + 1];
        vr = ir * nr - ii * ni;
        vi = ir * ni + ii * nr;
      }
      if (elements && !this.fastUnfold(b, bvr, bvi, bir, bii, out)) return false;
    }
    out.port[2] = vr;
    out.port[3] = vi;
    out.portBad[0] = out.portBad[1] = 0;
    checkRange(out.port[0], out.port[1], f);
    checkRange(vr, vi, f);
    if (elements) {
      for (let i = 0; i < table.rows; i++) {
        checkRange(out.vRe[i], out.vIm[i], f);
        checkRange(out.iRe[i], out.iIm[i], f);
      }
    }
    return true;
  }

  private fastUnfold(b: number, vr: number, vi: number, ir: number, ii: number, out: Solution): boolean {
    const { table, zr, zi, wr, wi } = this;
    const first = table.branchStart[b];
    for (let i = table.branchStart[b + 1] - 1; i > first; i--) {
      if (table.role[i] === PLUS) {
        out.vRe[i] = ir * zr[i] - ii * zi[i];
        out.vIm[i] = ir * zi[i] + ii * zr[i];
        out.iRe[i] = ir;
        out.iIm[i] = ii;
        const pr = wr[i - 1], pi = wi[i - 1];
        const nr = ir * pr - ii * pi;
        vi = ir * pi + ii * pr;
        vr = nr;
      } else {
        if (!cdiv(vr, vi, zr[i], zi[i])) return false;
        out.vRe[i] = vr;
        out.vIm[i] = vi;
        out.iRe[i] = OUT[0];
        out.iIm[i] = OUT[1];
        if (!cdiv(vr, vi, wr[i - 1], wi[i - 1])) return false;
        ir = OUT[0];
        ii = OUT[1];
      }
    }
    out.vRe[first] = vr;
    out.vIm[first] = vi;
    out.iRe[first] = ir;
    out.iIm[first] = ii;
    return true;
  }

  // ---- general pass (DC, resonances) ----

  /** Element impedances, branch composites and load impedances, right to left. */
  private backward(f: number): void {
    const { table, reg: r, values } = this;
    r[LOST] = 0;
    const w = 2 * Math.PI * f;
    for (let i = 0; i < table.rows; i++) {
      const d = this.zBase + i * SLOT;
      const v = values[i];
      const kind = table.kind[i];
      if (w === 0) {
        // ε = jω: R = R·ε⁰, L = L·ε¹, C = (1/C)·ε⁻¹, all exact (a₁ = 0).
        if (kind === L) setSlot(r, d, 1, 2, v, 0, 0, 0);
        else if (kind === C) setSlot(r, d, -1, 2, 1 / v, 0, 0, 0);
        else setSlot(r, d, 0, 2, v, 0, 0, 0);
      } else if (kind === L) setSlot(r, d, 0, 2, 0, w * v, 0, v);
      else if (kind === C) {
        const x = 1 / (w * v);
        setSlot(r, d, 0, 2, 0, -x, 0, x / w);
      } else setSlot(r, d, 0, 2, v, 0, 0, 0);
    }
    const t1 = this.tmp, t2 = this.tmp + SLOT;
    for (let i = 0; i < table.rows; i++) {
      const wi = this.wBase + i * SLOT, zi = this.zBase + i * SLOT;
      const role = table.role[i];
      if (role === PLUS) add(r, wi, wi - SLOT, zi);
      else if (role === ACROSS) parallel(r, wi, wi - SLOT, zi, t1, t2);
      else copy(r, wi, zi);
    }
    const last = this.lastShunt; // callers handle last < 0 (no path to ground) without a pass
    if (last >= 0) copy(r, this.lBase + last * SLOT, this.branchSlot(last));
    for (let b = last - 1; b >= 0; b--) {
      const lb = this.lBase + b * SLOT;
      if (table.role[table.branchStart[b]] === SHUNT) parallel(r, lb, this.branchSlot(b), lb + SLOT, t1, t2);
      else add(r, lb, this.branchSlot(b), lb + SLOT);
    }
    if (r[LOST]) throw indeterminate(f);
  }

  /** Slot of branch b's total impedance (the composite after its last row). */
  private branchSlot(b: number): number {
    return this.wBase + (this.table.branchStart[b + 1] - 1) * SLOT;
  }

  /** Node voltages and branch currents left to right, then each branch unfolded into its elements. */
  private forward(f: number, currentSource: boolean, out: Solution, elements: boolean): void {
    const { table, reg: r } = this;
    const last = this.lastShunt;
    const vn = this.tmp + 2 * SLOT, iin = vn + SLOT, vb = iin + SLOT, ib = vb + SLOT, scratch = ib + SLOT;
    if (currentSource) {
      setSlot(r, iin, 0, 2, 1, 0, 0, 0);
      copy(r, vn, this.lBase);
      out.portBad[0] = this.extract(vn, out.port, 0, f) ? 0 : 1;
    } else {
      setSlot(r, vn, 0, 2, 1, 0, 0, 0);
      inv(r, iin, this.lBase);
      out.portBad[0] = this.extract(iin, out.port, 0, f) ? 0 : 1;
    }
    for (let b = 0; b <= last; b++) {
      const zb = this.branchSlot(b);
      if (table.role[table.branchStart[b]] === SHUNT) {
        if (elements) {
          copy(r, vb, vn);
          div(r, ib, vn, zb, scratch);
        }
        if (b < last) div(r, iin, vn, this.lBase + (b + 1) * SLOT, scratch);
      } else {
        if (elements) {
          copy(r, ib, iin);
          mul(r, vb, iin, zb);
        }
        mul(r, vn, iin, this.lBase + (b + 1) * SLOT);
      }
      if (elements) this.unfold(b, vb, ib, out, f);
    }
    out.portBad[1] = this.extract(vn, out.port, 2, f) ? 0 : 1;
  }

  /**
   * Split a branch's voltage and current (slots vc, ic, overwritten) over its rows, last row first:
   * a `+` row carries the composite's current, a `||` row sees the composite's voltage.
   */
  private unfold(b: number, vc: number, ic: number, out: Solution, f: number): void {
    const { table, reg: r } = this;
    const first = table.branchStart[b];
    const ev = this.tmp + 7 * SLOT, scratch = ev - SLOT;
    for (let i = table.branchStart[b + 1] - 1; i > first; i--) {
      const zi = this.zBase + i * SLOT, wPrev = this.wBase + (i - 1) * SLOT;
      if (table.role[i] === PLUS) {
        mul(r, ev, ic, zi);
        this.store(i, ev, ic, out, f);
        mul(r, vc, ic, wPrev);
      } else {
        div(r, ev, vc, zi, scratch);
        this.store(i, vc, ev, out, f);
        div(r, ic, vc, wPrev, scratch);
      }
    }
    this.store(first, vc, ic, out, f);
  }

  private store(i: number, v: number, c: number, out: Solution, f: number): void {
    const pair = this.pair;
    let bad = 0;
    if (!this.extract(v, pair, 0, f)) bad |= V_UNBOUNDED;
    out.vRe[i] = pair[0];
    out.vIm[i] = pair[1];
    if (!this.extract(c, pair, 0, f)) bad |= I_UNBOUNDED;
    out.iRe[i] = pair[0];
    out.iIm[i] = pair[1];
    out.bad[i] = bad;
  }

  /** The value at the expansion point into out[at], out[at + 1]: 0 for k > 0, a₀ for k = 0; false (and 0) for k < 0. */
  private extract(x: number, out: Float64Array, at: number, f: number): boolean {
    const r = this.reg;
    const k = r[x + K];
    out[at] = out[at + 1] = 0;
    if (k < 0) return false;
    if (k === 0) {
      checkRange(r[x + A0R], r[x + A0I], f);
      out[at] = r[x + A0R] + 0;
      out[at + 1] = r[x + A0I] + 0;
    }
    return true;
  }
}

/** No path to ground: no current anywhere and the far end follows the source; a current source has no solution. */
function noPath(currentSource: boolean, out: Solution, elements: boolean): void {
  out.port.fill(0);
  if (currentSource) {
    out.portBad[0] = out.portBad[1] = 1;
    if (elements) out.bad.fill(V_UNBOUNDED | I_UNBOUNDED);
  } else {
    out.portBad[0] = out.portBad[1] = 0;
    out.port[2] = 1;
  }
}

/** A part that is not finite (overflow, or NaN after one) means the ladder left the double range. */
function checkRange(a: number, b: number, f: number): void {
  if (!(Math.abs(a) < Infinity && Math.abs(b) < Infinity)) {
    throw numError(
      `at ${describeFrequency(f)} a voltage or current of the ladder exceeds the floating-point range; ` +
        'check the component values and frequency.',
    );
  }
}

function indeterminate(f: number) {
  return numError(
    `at ${describeFrequency(f)} loss-free resonances coincide so exactly that the ideal network has no single ` +
      'solution; add the parts\u2019 ESR/DCR or a damping resistor.',
  );
}

/**
 * d = x·y / (x + y). Orders make an open (k < 0) or a short (k > 0) need no special case, and a cancelling
 * sum (parallel resonance) raises the denominator's order, making d an open.
 */
function parallel(r: Float64Array, d: number, x: number, y: number, t1: number, t2: number): void {
  add(r, t1, x, y);
  inv(r, t2, t1);
  mul(r, t1, x, y);
  mul(r, d, t1, t2);
}

/** Validate a frequency list (Hz): 1 … LIMITS.sweep finite values ≥ 0. */
export function checkFrequencies(freqs: ArrayLike<number>, what = 'frequency'): void {
  if (freqs.length === 0) throw valueError(`${what} must hold at least one frequency in Hz.`);
  if (freqs.length > LIMITS.sweep) {
    throw numError(`${what} holds ${freqs.length} frequencies; at most ${LIMITS.sweep} are allowed in one sweep.`);
  }
  for (let i = 0; i < freqs.length; i++) {
    const f = freqs[i];
    if (typeof f !== 'number' || Number.isNaN(f)) throw valueError(`${what} must be numbers in Hz; entry ${i + 1} is not.`);
    if (!(f >= 0 && f < Infinity)) throw numError(`${what} must be finite and ≥ 0 Hz; entry ${i + 1} is ${f}.`);
  }
}

/** portsBatch over a frequency list in Hz (the angular frequencies formed as solve() forms them). */
function sweepBatch(solver: LadderSolver, freqs: ArrayLike<number>, source: SourceKind): PortBatch {
  const K = freqs.length;
  const { w, batch } = batchBuffers(K);
  for (let k = 0; k < K; k++) w[k] = 2 * Math.PI * freqs[k];
  solver.portsBatch(w, K, source, batch);
  return batch;
}

export interface ComplexArrays {
  re: Float64Array;
  im: Float64Array;
}

/**
 * Impedance seen by the source (voltage source at node 1, far end open unless a shunt ends it), per frequency
 * in Hz. `values` optionally replaces the value column. Throws NUM where the ladder is an open circuit.
 */
export function impedance(table: LadderTable, freqs: ArrayLike<number>, values?: ArrayLike<number>): ComplexArrays {
  checkFrequencies(freqs);
  const solver = new LadderSolver(table, values);
  const re = new Float64Array(freqs.length), im = new Float64Array(freqs.length);
  // With a unit current source, the source voltage is the impedance.
  const batch = sweepBatch(solver, freqs, 'current');
  const z = new Float64Array(2);
  for (let i = 0; i < freqs.length; i++) {
    if (batch.ok[i]) {
      re[i] = batch.sRe[i];
      im[i] = batch.sIm[i];
      continue;
    }
    if (!solver.impedanceAt(freqs[i], z)) {
      const why =
        solver.lastShunt < 0
          ? 'nothing connects it to ground'
          : freqs[i] === 0
            ? 'its only paths to ground are capacitors'
            : 'a loss-free parallel resonance lands exactly on this frequency';
      throw numError(
        `the ladder is an open circuit at ${describeFrequency(freqs[i])} (${why}): its impedance is unbounded; ` +
          'add a resistor to ground or the parts\u2019 ESR/DCR.',
      );
    }
    re[i] = z[0];
    im[i] = z[1];
  }
  return { re, im };
}

/** Far-end voltage / source voltage per frequency in Hz. Throws NUM where it is unbounded. */
export function transfer(table: LadderTable, freqs: ArrayLike<number>, values?: ArrayLike<number>): ComplexArrays {
  checkFrequencies(freqs);
  const solver = new LadderSolver(table, values);
  const sol = makeSolution(table);
  const re = new Float64Array(freqs.length), im = new Float64Array(freqs.length);
  const batch = sweepBatch(solver, freqs, 'voltage');
  for (let i = 0; i < freqs.length; i++) {
    if (batch.ok[i]) {
      re[i] = batch.fRe[i];
      im[i] = batch.fIm[i];
      continue;
    }
    solver.solve(freqs[i], 'voltage', sol, false);
    if (sol.portBad[1]) {
      throw numError(
        `the transfer function is unbounded at ${describeFrequency(freqs[i])} (a loss-free resonance lands exactly ` +
          'on this frequency); add the parts\u2019 ESR/DCR or a damping resistor.',
      );
    }
    re[i] = sol.port[2];
    im[i] = sol.port[3];
  }
  return { re, im };
}
