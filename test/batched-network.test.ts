/**
 * The batched ladder pass (LadderSolver.portsBatch, used by RESPONSE, TRANSFER and IMPEDANCE for speed) must
 * give the numbers and the errors of solving one frequency at a time. The two are different formulas for the
 * same network (a backward cascade of the far end's V and I; loads and a forward pass), so they agree to
 * rounding, not to the bit: within NEAR of the largest value compared, on random ladders whose parts span six
 * decades. Common practice, no source: the reference here is the per-frequency solver itself.
 */
import { LadderTable, parseLadder } from '../src/core/ladder';
import { impedance, LadderSolver, makePortBatch, makeSolution, SourceKind, transfer } from '../src/core/network';
import { response } from '../src/core/response';
import { makeSpectrum, Spectrum } from '../src/core/spectrum';
import { rng } from './support/rng';


const ROLES = ['series', 'shunt', '+', '||'];
const KINDS = ['R', 'L', 'C'];
const SCALE = { R: 1, L: 1e-6, C: 1e-6 } as Record<string, number>;

function randomLadder(rand: () => number): LadderTable {
  const rows: (string | number)[][] = [];
  const n = 1 + Math.floor(rand() * 8);
  for (let i = 0; i < n; i++) {
    const role = i === 0 ? ROLES[Math.floor(rand() * 2)] : ROLES[Math.floor(rand() * 4)];
    const kind = KINDS[Math.floor(rand() * 3)];
    rows.push([role, kind, SCALE[kind] * 10 ** (rand() * 6 - 3)]);
  }
  return parseLadder(rows);
}

function randomSpectrum(rand: () => number, N: number): Spectrum {
  const s = makeSpectrum(1e3 * 10 ** (rand() * 3), N);
  for (let n = 0; n <= N; n++) {
    if (rand() < 0.2) continue; // some harmonics absent: they are never solved
    s.re[n] = rand() * 2 - 1;
    s.im[n] = n === 0 ? 0 : rand() * 2 - 1;
  }
  return s;
}

/** RESPONSE of the far end or the source, one harmonic at a time (the pre-batch method). */
function responseOneByOne(spec: Spectrum, table: LadderTable, quantity: 'V' | 'I', source: SourceKind): Spectrum | string {
  const solver = new LadderSolver(table);
  const sol = makeSolution(table);
  const N = spec.re.length - 1;
  const out = makeSpectrum(spec.f0, N);
  for (let n = 0; n <= N; n++) {
    const cr = spec.re[n], ci = n === 0 ? 0 : spec.im[n];
    if (cr === 0 && ci === 0) continue;
    try {
      solver.solve(n * spec.f0, source, sol, false);
    } catch (e) {
      return (e as Error).message;
    }
    let qr: number, qi: number, ok: boolean;
    if (quantity === 'V') [ok, qr, qi] = [!sol.portBad[1], sol.port[2], sol.port[3]];
    else if (source === 'voltage') [ok, qr, qi] = [!sol.portBad[0], sol.port[0], sol.port[1]];
    else [ok, qr, qi] = [solver.lastShunt >= 0, 1, 0];
    if (!ok) return `unbounded at ${n}`;
    out.re[n] = cr * qr - ci * qi;
    out.im[n] = n === 0 ? 0 : cr * qi + ci * qr;
  }
  return out;
}

function outcome(f: () => Spectrum): Spectrum | string {
  try {
    return f();
  } catch (e) {
    return (e as Error).message;
  }
}

/** Agreement of the two formulas, relative to the largest magnitude compared (see the header). */
const NEAR = 1e-12;
let worst = 0;
afterAll(() => console.log(`batched vs one-by-one: worst difference ${worst.toExponential(2)} of the largest value`));

/** Phasors a (re, im) against b: the largest |a − b| over the largest |b|. */
function near(are: ArrayLike<number>, aim: ArrayLike<number>, bre: ArrayLike<number>, bim: ArrayLike<number>): void {
  expect([are.length, aim.length]).toEqual([bre.length, bim.length]);
  let big = 0;
  let diff = 0;
  for (let i = 0; i < bre.length; i++) {
    big = Math.max(big, Math.hypot(bre[i], bim[i]));
    diff = Math.max(diff, Math.hypot(are[i] - bre[i], aim[i] - bim[i]));
  }
  const rel = big > 0 ? diff / big : diff;
  worst = Math.max(worst, rel);
  expect(rel).toBeLessThanOrEqual(NEAR);
}

const sameSpectrum = (a: Spectrum | string, b: Spectrum | string): void => {
  if (typeof a === 'string' || typeof b === 'string') {
    // Both failed (the messages differ only in wording between the two harnesses) or neither did.
    expect(typeof a).toBe(typeof b);
    return;
  }
  near(a.re, a.im, b.re, b.im);
};

describe('batched ladder pass equals the one-frequency-at-a-time solver', () => {
  it('RESPONSE of the far end and the source, random ladders and sources (150 cases, both source kinds)', () => {
    const rand = rng(20240611);
    let compared = 0;
    for (let c = 0; c < 150; c++) {
      const table = randomLadder(rand);
      const spec = randomSpectrum(rand, 1 + Math.floor(rand() * 200));
      for (const source of ['voltage', 'current'] as const) {
        for (const quantity of ['V', 'I'] as const) {
          const batched = outcome(() => response(spec, table, { quantity, source }));
          sameSpectrum(batched, responseOneByOne(spec, table, quantity, source));
          if (typeof batched !== 'string') compared++;
        }
      }
    }
    expect(compared).toBeGreaterThan(300); // most cases are regular, so the numbers are really compared
  });

  it('hands exact resonances and DC to the general pass (a trap tuned to harmonic 3, an L–C ladder at DC)', () => {
    // ω = 2π·3·f0 = 1e6 rad/s: L = 1 µH, C = 1 µF resonate exactly there; the trap shorts the far end.
    const f0 = 1e6 / (2 * Math.PI * 3);
    const trap = parseLadder([['series', 'R', 1], ['shunt', 'L', 1e-6], ['+', 'C', 1e-6], ['shunt', 'R', 50]]);
    const spec = makeSpectrum(f0, 6);
    spec.re.fill(1);
    const batched = response(spec, trap);
    sameSpectrum(batched, responseOneByOne(spec, trap, 'V', 'voltage'));
    expect(Math.abs(batched.re[3]) + Math.abs(batched.im[3])).toBeLessThan(1e-9); // the series trap shorts it
    const lc = parseLadder([['series', 'L', 1e-3], ['shunt', 'C', 1e-6]]);
    const withDc = makeSpectrum(1e3, 4);
    withDc.re.fill(1);
    const r = response(withDc, lc);
    sameSpectrum(r, responseOneByOne(withDc, lc, 'V', 'voltage'));
    expect(r.re[0]).toBe(1); // DC passes the inductor, the capacitor is open
  });

  it('TRANSFER and IMPEDANCE sweeps equal solve() and impedanceAt() at every frequency', () => {
    const rand = rng(99);
    for (let c = 0; c < 100; c++) {
      const table = randomLadder(rand);
      const freqs = Float64Array.from({ length: 1 + Math.floor(rand() * 600) }, () => (rand() < 0.05 ? 0 : 10 ** (rand() * 8)));
      const solver = new LadderSolver(table);
      const sol = makeSolution(table);
      const z = new Float64Array(2);
      let t: unknown;
      try {
        t = transfer(table, freqs);
      } catch (e) {
        t = 'error';
      }
      const tRef: number[][] = [];
      let tFailed = false;
      for (const f of freqs) {
        solver.solve(f, 'voltage', sol, false);
        if (sol.portBad[1]) tFailed = true;
        tRef.push([sol.port[2], sol.port[3]]);
      }
      if (tFailed) expect(t).toBe('error');
      else {
        const tv = t as { re: Float64Array; im: Float64Array };
        near(tv.re, tv.im, tRef.map((p) => p[0]), tRef.map((p) => p[1]));
      }
      let zv: { re: Float64Array; im: Float64Array } | undefined;
      try {
        zv = impedance(table, freqs);
      } catch {
        zv = undefined;
      }
      const zRef: number[][] = [];
      let zFailed = false;
      for (const f of freqs) {
        if (!solver.impedanceAt(f, z)) zFailed = true;
        zRef.push([z[0], z[1]]);
      }
      expect(zv === undefined).toBe(zFailed);
      if (zv) {
        near(zv.re, zv.im, zRef.map((p) => p[0]), zRef.map((p) => p[1]));
      }
    }
  });

  it('marks every slot for the general pass when the ladder has no path to ground or the fast pass is off', () => {
    const open = new LadderSolver(parseLadder([['series', 'R', 1], ['+', 'L', 1e-3]]));
    const batch = makePortBatch(3);
    batch.ok.fill(1);
    open.portsBatch(Float64Array.from([1, 2, 3]), 3, 'voltage', batch);
    expect(Array.from(batch.ok)).toEqual([0, 0, 0]);
    const slow = new LadderSolver(parseLadder([['series', 'R', 1], ['shunt', 'R', 1]]));
    slow.fast = false;
    batch.ok.fill(1);
    slow.portsBatch(Float64Array.from([1, 2, 3]), 3, 'voltage', batch);
    expect(Array.from(batch.ok)).toEqual([0, 0, 0]);
    slow.fast = true;
    slow.portsBatch(Float64Array.from([0, 2, 3]), 3, 'voltage', batch);
    expect(Array.from(batch.ok)).toEqual([0, 1, 1]); // DC always takes the general pass
  });
});
