/**
 * The `cell` baseline: the same analysis written the straightforward way with mathjs complex numbers — the
 * ladder impedances built per harmonic with complex add / multiply / divide, folded from the far end, the
 * divider ratios multiplied out from the source, RMS by Parseval, and the peak-to-peak by sampling the
 * waveform (plain Math.cos on amplitude and phase) at 8·N points per period.
 */
import { all, Complex, create } from 'mathjs';
import { LadderTable, ACROSS, C, L, PLUS, SHUNT } from '../src/core/ladder';

const math = create(all, {});
type Z = Complex;

const par = (a: Z, b: Z): Z => math.divide(math.multiply(a, b), math.add(a, b)) as Z;

/** Far-end voltage phasors for a source table (rows n, f, amplitude, phase deg); DC handled with L = 0, C = open. */
export function farEndPhasors(sourceRows: number[][], ladder: LadderTable, values: ArrayLike<number> = ladder.value): Z[] {
  const out: Z[] = [];
  const OPEN = math.complex(1e30, 0);
  for (const [n, f, amp, ph] of sourceRows) {
    const src = math.complex({ r: amp, phi: (ph * Math.PI) / 180 }) as Z;
    const w = 2 * Math.PI * f;
    // element impedances and branch composites
    const branch: Z[] = [];
    let cur: Z = math.complex(0, 0);
    for (let i = 0; i < ladder.rows; i++) {
      const v = values[i];
      const k = ladder.kind[i];
      let z: Z;
      if (k === L) z = math.complex(0, w * v);
      else if (k === C) z = n === 0 ? OPEN : (math.divide(1, math.complex(0, w * v)) as Z);
      else z = math.complex(v, 0);
      const role = ladder.role[i];
      if (role === PLUS) cur = math.add(cur, z) as Z;
      else if (role === ACROSS) cur = par(cur, z);
      else {
        if (i > 0) branch.push(cur);
        cur = z;
      }
    }
    branch.push(cur);
    // load impedance seen at each branch, from the far end
    const B = branch.length;
    const isShunt = (b: number): boolean => ladder.role[ladder.branchStart[b]] === SHUNT;
    let last = B - 1;
    while (last >= 0 && !isShunt(last)) last--;
    const load: Z[] = new Array(B);
    load[last] = branch[last];
    for (let b = last - 1; b >= 0; b--) load[b] = isShunt(b) ? par(branch[b], load[b + 1]) : (math.add(branch[b], load[b + 1]) as Z);
    // node voltage divided down through each series branch
    let h: Z = math.complex(1, 0);
    for (let b = 0; b < last; b++) {
      if (!isShunt(b)) h = math.multiply(h, math.divide(load[b + 1], load[b])) as Z;
    }
    out.push(math.multiply(src, h) as Z);
  }
  return out;
}

export function rmsOf(v: Z[]): number {
  let s = 0;
  for (let n = 0; n < v.length; n++) {
    const a = math.abs(v[n]) as unknown as number;
    s += n === 0 ? a * a : (a * a) / 2;
  }
  return Math.sqrt(s);
}

/** Peak-to-peak of Σ A_n cos(nθ + φ_n) sampled at 8·N points per period. */
export function ppOf(v: Z[]): number {
  const N = v.length - 1;
  const amp = v.map((z) => math.abs(z) as unknown as number);
  const ph = v.map((z) => math.arg(z) as unknown as number);
  const P = 8 * N;
  let hi = -Infinity;
  let lo = Infinity;
  for (let k = 0; k < P; k++) {
    const th = (2 * Math.PI * k) / P;
    let x = v[0].re;
    for (let n = 1; n <= N; n++) x += amp[n] * Math.cos(n * th + ph[n]);
    if (x > hi) hi = x;
    if (x < lo) lo = x;
  }
  return hi - lo;
}
