import { HcError, numError, valueError } from './errors';
import { peak, pp, valley } from './extremes-scaled';
import { describeElement, LadderTable, withValues } from './ladder';
import { grouped, LIMITS, SPREAD_MEASURE_WEIGHT } from './limits';
import { crest, mean, rms, thd } from './measures';
import { LadderSolver, makeSolution, Solution, SourceKind } from './network';
import { Quantity, response, responseInto } from './response';
import { makeSpectrum, order, Spectrum } from './spectrum';

/**
 * Tolerance spread of one measure of one response (DESIGN §3 HC.SPREAD). Each part with a tolerance t % in
 * the ladder (after the values override replaced the nominal values) varies over value × (1 ± t/100).
 *
 * - Corners (trials omitted or 0): the measure at the nominal and at every corner of the tolerance box, each
 *   toleranced part at its −t or +t end; 2^k cases for k toleranced parts, refused above LIMITS.corners.
 * - Monte Carlo (trials > 0): the nominal plus `trials` boards, each part drawn independently and uniformly
 *   over value × [1 − t/100, 1 + t/100) (a flat distribution: it stresses the band edges more than the bell
 *   curve of a real lot, and it needs no assumption about the lot's sigma). The generator (xoshiro128**) is
 *   seeded from a hash of the ladder alone (values after the override, tolerances, roles, kinds), so a
 *   recalculation gives the same numbers, every SPREAD on the same ladder sees the same boards whatever the
 *   spectrum, measure, quantity or element, and more trials extend the same sequence.
 *
 * min and max are taken over the nominal and all cases evaluated, so min ≤ nominal ≤ max.
 *
 * A corner spread can miss the worst case: a measure need not be monotonic in the values. When a loss-free or
 * lightly damped resonance moves across a harmonic inside the tolerance band, the peak response lies inside
 * the box and every corner sits on the resonance's skirts. Monte Carlo samples the interior and finds such
 * cases (with enough trials to land near the resonance); neither method proves a bound.
 */

export type Measure = 'mean' | 'rms' | 'acrms' | 'peak' | 'valley' | 'pp' | 'crest' | 'thd';
export const MEASURES: readonly Measure[] = ['mean', 'rms', 'acrms', 'peak', 'valley', 'pp', 'crest', 'thd'];

const MEASURE_FNS: Readonly<Record<Measure, (s: Spectrum) => number>> = {
  mean: (s) => mean(s),
  rms: (s) => rms(s, false),
  acrms: (s) => rms(s, true),
  peak: (s) => peak(s),
  valley: (s) => valley(s),
  pp: (s) => pp(s),
  crest: (s) => crest(s),
  thd: (s) => thd(s, 'fundamental'),
};

export interface SpreadOptions {
  /** 'V' (default): far-end voltage, or the voltage across the element; 'I': source current, or the element's. */
  quantity?: Quantity;
  /** 0-based ladder row; −1 or undefined for the default (far end / source). */
  element?: number;
  /** Omitted or 0: every corner; 1 … LIMITS.trials: Monte Carlo with that many boards. */
  trials?: number;
  /** One value per ladder row replacing the nominal values before the tolerances apply. */
  values?: ArrayLike<number>;
  /** 'voltage' (default) or 'current'. */
  source?: SourceKind;
  /** Monte Carlo seed (a 32-bit integer) in place of the hash of the ladder; for tests and studies. */
  seed?: number;
}

export interface Spread {
  min: number;
  nominal: number;
  max: number;
  /** 'corners' or 'monte-carlo'. */
  method: 'corners' | 'monte-carlo';
  /** Cases evaluated besides the nominal (2^k corners, or the trials). */
  cases: number;
  /** The part values (one per ladder row) where min and max occurred. */
  minValues: Float64Array;
  maxValues: Float64Array;
}

export function parseMeasure(measure: unknown, what = 'measure'): Measure {
  const key = typeof measure === 'string' ? measure.trim().toLowerCase() : '';
  if ((MEASURES as readonly string[]).includes(key)) return key as Measure;
  const text = typeof measure === 'string' ? measure : String(measure);
  const given = typeof measure === 'string' ? `'${text.length > 40 ? `${text.slice(0, 37)}...` : text}'` : text.slice(0, 40);
  throw valueError(`${what} ${given} is not known; use one of ${MEASURES.join(', ')}.`);
}

function checkTrials(trials: unknown): number {
  if (trials === undefined || trials === null) return 0;
  if (typeof trials !== 'number' || Number.isNaN(trials)) throw valueError('trials must be a whole number of Monte Carlo trials.');
  if (!Number.isInteger(trials) || trials < 0 || trials > LIMITS.trials) {
    throw numError(
      `trials must be a whole number from 1 to ${LIMITS.trials} for a Monte Carlo spread (omit it, or give 0, ` +
        `for every tolerance corner), got ${trials}.`,
    );
  }
  return trials;
}

/* ------------------------------------------------------------------------------------------------------ */
/* Seed and generator                                                                                        */

/** FNV-1a over the ladder's numbers (values, tolerances as float64 bits; roles, kinds), finished by a mixer. */
export function ladderSeed(table: LadderTable, values: ArrayLike<number>): number {
  const f = new Float64Array(1);
  const w = new Uint32Array(f.buffer);
  let h = 0x811c9dc5;
  const word = (x: number): void => {
    for (let b = 0; b < 32; b += 8) h = Math.imul(h ^ ((x >>> b) & 0xff), 0x01000193);
  };
  const float = (x: number): void => {
    f[0] = x;
    word(w[0]);
    word(w[1]);
  };
  word(table.rows);
  for (let i = 0; i < table.rows; i++) {
    word(table.role[i] * 4 + table.kind[i]);
    float(values[i]);
    float(table.tolerance[i]);
  }
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/** xoshiro128** (Blackman and Vigna), state filled by splitmix32 from a 32-bit seed. */
export class Xoshiro128 {
  private a: number;
  private b: number;
  private c: number;
  private d: number;

  constructor(seed: number) {
    let s = seed >>> 0;
    const split = (): number => {
      s = (s + 0x9e3779b9) | 0;
      let z = s;
      z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
      z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
      return (z ^ (z >>> 16)) >>> 0;
    };
    this.a = split();
    this.b = split();
    this.c = split();
    this.d = split();
  }

  /** Next 32-bit output as an unsigned integer. */
  next(): number {
    const r = Math.imul(rotl(Math.imul(this.b, 5), 7), 9) >>> 0;
    const t = this.b << 9;
    this.c ^= this.a;
    this.d ^= this.b;
    this.b ^= this.c;
    this.a ^= this.d;
    this.c ^= t;
    this.d = rotl(this.d, 11);
    return r;
  }

  /** Uniform in [0, 1). */
  uniform(): number {
    return this.next() / 4294967296;
  }
}

const rotl = (x: number, k: number): number => (x << k) | (x >>> (32 - k));

/* ------------------------------------------------------------------------------------------------------ */
/* One response per case, without allocation                                                                 */

/** Re-evaluates one response of the ladder for the values in `work`, into a reused spectrum. */
class CaseResponse {
  readonly out: Spectrum;
  private readonly solver: LadderSolver;
  private readonly sol: Solution;

  constructor(
    private readonly spec: Spectrum,
    private readonly table: LadderTable,
    private readonly work: Float64Array,
    private readonly quantity: Quantity,
    private readonly element: number,
    private readonly source: SourceKind,
  ) {
    this.solver = new LadderSolver(table, work);
    this.sol = makeSolution(table);
    this.out = makeSpectrum(spec.f0, order(spec));
  }

  /** The response for the present values; false where it is unbounded (the caller asks response() for the message). */
  run(): boolean {
    this.solver.setValues(this.work);
    return responseInto(this.spec, this.solver, this.quantity, this.element, this.source, this.out, this.sol) < 0;
  }

  /** The descriptive error response() gives for the present values, prefixed with where in the spread it happened. */
  failure(where: string): HcError {
    try {
      response(this.spec, withValues(this.table, this.work), {
        quantity: this.quantity, element: this.element, source: this.source,
      });
    } catch (e) {
      if (e instanceof HcError) return new HcError(e.code, `${where}: ${e.message}`);
      throw e;
    }
    return numError(`${where}: the response is unbounded; add the parts\u2019 ESR/DCR or a damping resistor.`);
  }
}

/* ------------------------------------------------------------------------------------------------------ */

export function spread(spec: Spectrum, table: LadderTable, measure: Measure | string, opts: SpreadOptions = {}): Spread {
  const m = parseMeasure(measure);
  const fn = MEASURE_FNS[m];
  const trials = checkTrials(opts.trials);
  const quantity = opts.quantity ?? 'V';
  const element = opts.element ?? -1;
  const source = opts.source ?? 'voltage';
  if (opts.seed !== undefined && !Number.isInteger(opts.seed)) throw valueError(`seed must be a whole number, got ${opts.seed}.`);

  checkSpreadWork(0, order(spec) + 1, table.rows, m);
  // The nominal goes through response() itself: it validates every argument and words every error.
  const nominalTable = opts.values ? withValues(table, opts.values) : table;
  const base = Float64Array.from(nominalTable.value);
  const nominal = fn(response(spec, nominalTable, { quantity, element, source }));

  const parts: number[] = [];
  for (let i = 0; i < table.rows; i++) if (table.tolerance[i] > 0) parts.push(i);
  const k = parts.length;

  const result: Spread = {
    min: nominal, nominal, max: nominal, method: trials > 0 ? 'monte-carlo' : 'corners', cases: 0,
    minValues: Float64Array.from(base), maxValues: Float64Array.from(base),
  };
  if (k === 0) return result;

  let cases: number;
  if (trials === 0) {
    if (k > Math.log2(LIMITS.corners)) {
      throw numError(
        `${k} parts of the ladder have tolerances, which makes 2^${k} = ${2 ** k} corners; at most ` +
          `${LIMITS.corners} (${Math.log2(LIMITS.corners)} toleranced parts) are evaluated. Give trials ` +
          `(e.g. 1000, at most ${LIMITS.trials}) for a Monte Carlo spread, or set the tolerance of minor parts to 0.`,
      );
    }
    cases = 2 ** k;
  } else cases = trials;
  result.cases = cases;
  checkSpreadWork(cases, order(spec) + 1, table.rows, m);

  const work = Float64Array.from(base);
  const lo = new Float64Array(k), hi = new Float64Array(k);
  for (let j = 0; j < k; j++) {
    const t = table.tolerance[parts[j]] / 100;
    lo[j] = base[parts[j]] * (1 - t);
    hi[j] = base[parts[j]] * (1 + t);
  }
  const caseResponse = new CaseResponse(spec, table, work, quantity, element, source);
  const rng = trials > 0 ? new Xoshiro128(opts.seed ?? ladderSeed(table, base)) : null;

  for (let c = 0; c < cases; c++) {
    if (rng) {
      // Draw order is fixed (trial by trial, parts in ladder order) so that more trials extend the sequence.
      for (let j = 0; j < k; j++) {
        const u = rng.uniform();
        work[parts[j]] = lo[j] + (hi[j] - lo[j]) * u;
      }
    } else {
      for (let j = 0; j < k; j++) work[parts[j]] = (c >>> j) & 1 ? hi[j] : lo[j];
    }
    if (!caseResponse.run()) throw caseResponse.failure(rng ? `In Monte Carlo trial ${c + 1}` : cornerName(table, parts, c));
    const x = fn(caseResponse.out);
    if (x < result.min) {
      result.min = x;
      result.minValues.set(work);
    }
    if (x > result.max) {
      result.max = x;
      result.maxValues.set(work);
    }
  }
  return result;
}

/** LIMITS.spreadWork: every case solves the ladder and takes the measure at every harmonic. */
function checkSpreadWork(cases: number, points: number, rows: number, m: Measure): void {
  const extremesMeasure = m === 'peak' || m === 'valley' || m === 'pp' || m === 'crest';
  const weight = extremesMeasure ? SPREAD_MEASURE_WEIGHT.extremes : SPREAD_MEASURE_WEIGHT.sums;
  const work = (cases + 1) * points * (rows + weight);
  if (work <= LIMITS.spreadWork) return;
  throw numError(
    `SPREAD would evaluate ${grouped(cases + 1)} cases (with the nominal) × ${grouped(points)} harmonics × ` +
      `(${rows} ladder rows + ${weight} for the measure ${m}) = ${grouped(work)}; at most ${grouped(LIMITS.spreadWork)} ` +
      'fit in one cell. Use fewer trials, fewer toleranced parts (each doubles the corners), fewer harmonics or fewer ladder rows.',
  );
}

/** "At the tolerance corner L1 (row 1) +20 %, C1 (row 2) −20 %", for messages. */
function cornerName(table: LadderTable, parts: number[], c: number): string {
  const ends = parts.map((p, j) => `${describeElement(table, p)} ${(c >>> j) & 1 ? '+' : '\u2212'}${table.tolerance[p]} %`);
  return `At the tolerance corner ${ends.join(', ')}`;
}
