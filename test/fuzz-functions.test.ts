/**
 * Property-based tests (fast-check) over every function of the table, called through invoke() with random and
 * garbage arguments: plausible spectra, ladders and sweeps with mutations, special numbers (NaN, ±Infinity,
 * 1e308, 5e-324, −0), engineering text and junk, booleans, null/undefined and nested arrays of random shapes.
 * Properties (DESIGN §3 "Bad input"): invoke never throws; an error has code VALUE, NUM or NA and a short,
 * non-empty message that is not the catch-all for an unexpected exception or a non-finite result; a value has
 * the declared shape (a finite number, a text, or a non-empty rectangular matrix of finite numbers and texts).
 * A few metamorphic checks follow (exact power-of-two scaling of spectra and ladders), and a fuzz of the same
 * calls through the headless engine. Fixed seed and run counts, so CI is repeatable. Common practice, no source.
 */
import fc from 'fast-check';
import { DetailedCellError } from 'hyperformula';
import { FUNCTIONS, FUNCTION_BY_NAME } from '../src/functions/table';
import { FunctionSpec } from '../src/functions/spec';
import { CallResult, invoke } from '../src/functions/invoke';
import { pulse, ramp, rectified, sine } from '../src/core/waveforms';
import { spectrumToTable } from '../src/core/spectrum';
import { createEngine } from '../src/engine/engine';
import { engineFormula } from '../src/engine/formula-text';

/** Fixed for CI; HC_FUZZ_SEED and HC_FUZZ_SCALE (a run-count multiplier) explore further by hand. */
const SEED = Number(process.env.HC_FUZZ_SEED ?? 0x6c1d2026);
const SCALE = Number(process.env.HC_FUZZ_SCALE ?? 1);
const runs = (n: number): number => Math.max(1, Math.round(n * SCALE));

/* ---------------------------------------------------------------- scalars */

const SPECIAL_NUMBERS = [
  NaN, Infinity, -Infinity, 1e308, -1e308, 1.7976931348623157e308, 5e-324, -5e-324, 2.2250738585072014e-308,
  0, -0, 1, -1, 0.5, 2, 1e-12, 1e12, 1e-300, 1e300, 10000, 10001, 2 ** 31, 2 ** 53, -3.5,
];
const specialNumber = fc.constantFrom(...SPECIAL_NUMBERS);
const anyNumber = fc.oneof(specialNumber, fc.double(), fc.integer({ min: -20, max: 20050 }), fc.double({ min: -1e3, max: 1e3, noNaN: true }));

const ENGINEERING_TEXT = [
  '4k7', '2u2', '100 nF', '2.2 mH', 'R47', '4R7', '1e3', ' 12 ', '\u22125', '1M', '10 kHz', '0.5', '50', '-1', '1e-6',
  'Infinity', 'NaN', '0x10', '1e999', '1e-999', '5 F', '3 H', '47 Ω', '10 ohm', '1,5', '', '   ',
];
const CHOICE_WORDS = [
  'full', 'half', 'polar', 'rect', 'complex', 'db', 'V', 'I', 'voltage', 'current', 'rms', 'acrms', 'pp', 'peak',
  'valley', 'mean', 'thd', 'crest', 'E24', 'E3', 'E192', 'e96', '24', 'up', 'down', 'nearest', 'fundamental',
  'series', 'shunt', '+', '||', 'R', 'L', 'C', 'L1', 'C1', 'constructor', '__proto__', 'toString', 'hasOwnProperty',
  'F', 'H', 'Hz', 'Ω', 'ohm', 's', 'TRUE', 'yes',
];
const text = fc.oneof(
  fc.constantFrom(...ENGINEERING_TEXT, ...CHOICE_WORDS),
  fc.string({ maxLength: 12 }),
  fc.string({ unit: 'grapheme', maxLength: 8 }),
  fc.constantFrom('1'.repeat(300) + ' 1 1', 'x'.repeat(5000), '9'.repeat(400)),
);
type Cell = number | string | boolean | null | undefined;
const cell: fc.Arbitrary<Cell> = fc.oneof(
  { weight: 4, arbitrary: anyNumber },
  { weight: 3, arbitrary: text },
  { weight: 1, arbitrary: fc.boolean() },
  { weight: 1, arbitrary: fc.constantFrom(null, undefined) },
);
/** Large ranges, built once: a quarter-million numbers, a whole column of blanks, a row of 20 000 cells. */
const BIG_COLUMN = Array.from({ length: 250_000 }, (_, i) => [Math.sin(i)]);
const BLANK_COLUMN = Array.from({ length: 1 << 20 }, () => [null]);
const WIDE_ROW = [Array.from({ length: 20_000 }, (_, i) => i + 1)];
const FOUR_COLUMNS = Array.from({ length: 300_000 }, (_, i) => [1, 50, 1 / (i + 1), 0]);

/** Ranges of random shapes, ragged rows, 3-D nesting and 1-D arrays included. */
const junkRange: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 1, arbitrary: fc.constantFrom<unknown>(BIG_COLUMN, BLANK_COLUMN, WIDE_ROW, FOUR_COLUMNS) },
  { weight: 8, arbitrary: fc.array(fc.array(cell, { maxLength: 6 }), { maxLength: 7 }) },
  { weight: 4, arbitrary: fc.array(cell, { maxLength: 6 }) },
  { weight: 2, arbitrary: fc.array(fc.array(fc.array(cell, { maxLength: 2 }), { maxLength: 2 }), { maxLength: 2 }) },
  { weight: 1, arbitrary: fc.constantFrom<unknown>([[]], []) },
);
const garbage: fc.Arbitrary<unknown> = fc.oneof({ weight: 3, arbitrary: cell }, { weight: 1, arbitrary: junkRange });

/* ---------------------------------------------------------------- plausible tables and their mutations */

type Grid = unknown[][];

const plausibleSpectrum: fc.Arbitrary<Grid> = fc
  .record({
    kind: fc.constantFrom('pulse', 'ramp', 'rect', 'sine'),
    n: fc.integer({ min: 0, max: 40 }),
    f: fc.constantFrom(50, 1000, 400e3, 1e-3, 3e9),
    a: fc.constantFrom(1, 12, -5, 1e-9, 325),
    d: fc.double({ min: 0, max: 1, noNaN: true }),
  })
  .map(({ kind, n, f, a, d }) => {
    const duty = 0.05 + 0.9 * d; // edges of 1 % and 2 % of the period always fit
    const s =
      kind === 'pulse' ? pulse(0, a, duty, f, n, 0.01 / f, 0.02 / f) : kind === 'ramp' ? ramp(-a, a, f, n, d) : kind === 'rect' ? rectified(a, f, n, d < 0.5 ? 'half' : 'full') : sine(a, f, d * 360);
    return spectrumToTable(s) as Grid;
  });

const ROLES = ['series', 'shunt', '+', '||', 'across', 'in series', 'to ground', 'plus'];
const KINDS = ['R', 'L', 'C', 'resistor', 'c'];
/** Values without a unit fit any kind (pF to kH among them); a unit is given only where the kind is known. */
const PART_VALUES: Cell[] = [1, 10, 0.01, 1e-6, 4.7e-12, 1e3, '4k7', '2u2', '100n', '10m', '1p', '1k', 0.1, 47e-6, '10 ohm'];
const LADDER_VALUES: Cell[] = [1, 10, 0.01, 1e-6, 4.7e-12, 1e3, '4k7', '2u2', '100n', '10m', '1p', '1k', 0.1, 47e-6];
const ladderRow = fc.tuple(
  fc.constantFrom(...ROLES),
  fc.constantFrom(...KINDS),
  fc.constantFrom(...LADDER_VALUES),
  fc.constantFrom<Cell>(null, 0, 5, 10, '20%', 1),
);
const plausibleLadder: fc.Arbitrary<Grid> = fc
  .tuple(fc.constantFrom('series', 'shunt'), fc.array(ladderRow, { minLength: 0, maxLength: 7 }), fc.boolean(), fc.boolean())
  .map(([first, rows, withNames, header]) => {
    const out: Grid = rows.map((r, i) => (withNames ? [...r, `P${i + 2}`] : [...r]));
    out.unshift(withNames ? [first, 'R', 1, 5, 'P1'] : [first, 'R', 1, 5]);
    if (header) out.unshift(withNames ? ['Role', 'Kind', 'Value', 'Tol %', 'Name'] : ['Role', 'Kind', 'Value', 'Tol %']);
    return out;
  });

/** One mutation of a table: a cell set to garbage, a row inserted, a column dropped or added, a scale, rows swapped. */
const mutation = fc.record({
  what: fc.constantFrom('cell', 'header', 'blank', 'dropColumn', 'addColumn', 'scale', 'swap', 'negate', 'none', 'none'),
  r: fc.nat(50),
  c: fc.nat(6),
  value: garbage,
  scale: fc.constantFrom(2 ** 900, 2 ** -900, 1e308, 5e-324, -1, 1e-12),
});
function mutate(grid: Grid, m: { what: string; r: number; c: number; value: unknown; scale: number }): Grid {
  const g = grid.map((row) => [...row]);
  if (g.length === 0) return g;
  const r = m.r % g.length;
  switch (m.what) {
    case 'cell':
      g[r][m.c % Math.max(1, g[r].length)] = m.value;
      break;
    case 'header':
      g.splice(r, 0, ['n', 'frequency', 'amplitude', 'phase']);
      break;
    case 'blank':
      g.splice(r, 0, [null, '', null, null]);
      break;
    case 'dropColumn':
      for (const row of g) row.pop();
      break;
    case 'addColumn':
      for (const row of g) row.push(m.value as Cell);
      break;
    case 'scale':
      for (const row of g) if (typeof row[2] === 'number') row[2] *= m.scale;
      break;
    case 'swap':
      [g[0], g[r]] = [g[r], g[0]];
      break;
    case 'negate':
      if (typeof g[r][2] === 'number') g[r][2] = -(g[r][2] as number);
      break;
  }
  return g;
}
const mutated = (table: fc.Arbitrary<Grid>): fc.Arbitrary<Grid> =>
  fc
    .tuple(table, fc.oneof({ weight: 4, arbitrary: fc.constant([]) }, { weight: 2, arbitrary: fc.array(mutation, { minLength: 1, maxLength: 2 }) }))
    .map(([g, ms]) => ms.reduce(mutate, g));

const column = (values: fc.Arbitrary<unknown>, max = 12): fc.Arbitrary<Grid> =>
  fc.array(values, { minLength: 0, maxLength: max }).map((v) => v.map((x) => [x]));
const increasingTimes: fc.Arbitrary<Grid> = fc
  .array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 1, maxLength: 10 })
  .map((d) => {
    let t = 0;
    return d.map((x) => [(t += x * 1e-6)]);
  });

/* ---------------------------------------------------------------- an argument by name and kind */

/** Mostly `good`, sometimes a special or junk value of the same kind. */
const mostly = <T,>(good: fc.Arbitrary<T>, bad: fc.Arbitrary<unknown> = anyNumber): fc.Arbitrary<unknown> =>
  fc.oneof({ weight: 6, arbitrary: good }, { weight: 1, arbitrary: bad });

/** A clean (mostly valid) value for an argument, by its name and kind. */
function plausibleArg(spec: FunctionSpec, name: string, kind: string): fc.Arbitrary<unknown> {
  switch (name) {
    case 'spectrum':
    case 'voltage_spectrum':
    case 'current_spectrum':
      return mutated(plausibleSpectrum);
    case 'ladder':
      return mutated(plausibleLadder);
    case 'values':
      if (spec.name === 'SAMPLED') return column(mostly(fc.double({ min: -10, max: 10, noNaN: true }), cell), 64);
      return fc.constant(null); // a values override needs its ladder: see ladderCall
    case 'times':
      return increasingTimes;
    case 'frequency':
      return spec.args.find((a) => a.name === 'frequency')?.kind === 'range'
        ? mostly(fc.oneof(fc.constantFrom<unknown>(0, 50, 1e3, 1e5, 1e9, '10 kHz'), column(fc.constantFrom<Cell>(1e3, 1e6, 50, 0, '1 MHz'), 6)))
        : mostly(fc.constantFrom(50, 1000, 250e3, '20 kHz', 1e-3));
    case 'line_frequency':
    case 'sample_rate':
      return mostly(fc.constantFrom(50, 60, 1000, 12800, '400k'));
    case 'harmonics':
      return mostly(fc.integer({ min: 0, max: 30 }), fc.oneof(anyNumber, fc.constantFrom(10000, 10001, 2000)));
    case 'points':
      return mostly(fc.integer({ min: 2, max: 300 }));
    case 'periods':
      return mostly(fc.constantFrom(1, 2.5, 0.3, 999.7, 1000));
    case 'trials':
      return mostly(fc.constantFrom<unknown>(null, 0, 1, 5, 20), fc.constantFrom(10000, 10001, -1, 2.5, NaN, true, 'x'));
    case 'element':
      return mostly(fc.constantFrom<unknown>(null, null, 'P1', 'p2', 1, 2, '2'), fc.constantFrom<unknown>(0, -1, 2.5, 99, 'nope', true, 1e308, NaN));
    case 'mode':
      return mostly(fc.constantFrom('full', 'half', 'Half-Wave', null), text);
    case 'form':
      return mostly(fc.constantFrom('polar', 'rect', 'complex', 'db', null), text);
    case 'quantity':
      return mostly(fc.constantFrom('V', 'I', 'voltage', null), text);
    case 'source':
      return mostly(fc.constantFrom('voltage', 'current', null, null), text);
    case 'measure':
      return mostly(fc.constantFrom('mean', 'rms', 'acrms', 'peak', 'valley', 'pp', 'crest', 'thd'), text);
    case 'reference':
      return mostly(fc.constantFrom('fundamental', 'rms', null), text);
    case 'series':
      return mostly(fc.constantFrom('E3', 'E24', 'e96', 'E192', 24, null), text);
    case 'direction':
      return mostly(fc.constantFrom('nearest', 'up', 'down', null), text);
    case 'unit':
      return mostly(fc.constantFrom('F', 'H', 'Ω', 'ohm', 'Hz', 'V', null), text);
    case 'text':
      return fc.oneof(fc.constantFrom(...ENGINEERING_TEXT), anyNumber, text);
    case 'duty':
    case 'rise_fraction':
      return mostly(fc.double({ min: 0, max: 1, noNaN: true }));
    case 'rise':
    case 'fall':
    case 'delay':
    case 'period':
      return mostly(fc.constantFrom<unknown>(null, 0, 1e-9, 1e-7));
    case 'time':
      return mostly(fc.double({ min: -1, max: 1, noNaN: true }));
    case 'digits':
      return mostly(fc.integer({ min: 1, max: 15 }));
  }
  if (kind === 'bool') return fc.constantFrom<unknown>(true, false, 0, 1, 'TRUE', 'no', null, 2, 'maybe');
  return mostly(fc.constantFrom<unknown>(0, 1, 12, -5, 50, 1000, 325, '4k7', '2u2', 0.047));
}

/** A values override with one entry per row of `ladder` (sometimes one too few, sometimes a row instead of a column). */
function valuesFor(ladder: Grid): fc.Arbitrary<unknown> {
  const rows = ladder.filter((r) => ['series', 'shunt', '+', '||', 'across', 'in series', 'to ground', 'plus'].includes(String(r[0]))).length;
  const entry = fc.constantFrom<Cell>(...LADDER_VALUES, 0, -1, null, 'x', '1 kH');
  return fc.oneof(
    { weight: 3, arbitrary: fc.constant(null) },
    { weight: 2, arbitrary: fc.array(fc.constantFrom<Cell>(...LADDER_VALUES), { minLength: rows, maxLength: rows }).map((v) => v.map((x) => [x])) },
    { weight: 1, arbitrary: fc.array(entry, { minLength: Math.max(0, rows - 1), maxLength: rows + 1 }).map((v) => [v]) },
  );
}

/** Clean arguments for one call; PWL pairs its columns, ladder functions match their values override. */
function cleanArgs(spec: FunctionSpec): fc.Arbitrary<unknown[]> {
  if (spec.args.length === 1 && spec.args[0].repeating) {
    return fc.array(plausibleArg(spec, 'spectrum', 'range'), { minLength: 1, maxLength: 4 });
  }
  const each = fc.tuple(...spec.args.map((a) => plausibleArg(spec, a.name, a.kind)));
  if (spec.name === 'PWL') {
    const pairs = fc.array(fc.tuple(fc.double({ min: 0, max: 1, noNaN: true }), fc.double({ min: -5, max: 5, noNaN: true })), { minLength: 1, maxLength: 12 });
    return fc.tuple(each, pairs).map(([args, p]) => {
      let t = 0;
      return [p.map(([d]) => [(t += d * 1e-6)]), p.map(([, v]) => [v]), ...args.slice(2)];
    });
  }
  if (spec.name === 'SAMPLED') {
    // At least 2N samples for N harmonics.
    return fc.tuple(each, fc.integer({ min: 0, max: 30 }), fc.array(fc.double({ min: -10, max: 10, noNaN: true }), { minLength: 61, maxLength: 80 }))
      .map(([args, n, x]) => [x.slice(0, 2 * n + 1 + (n % 3)).map((y) => [y]), args[1], n]);
  }
  if (spec.name === 'POWER') {
    // Voltage and current on one fundamental: the current is a scaled, shifted copy of a second waveform.
    return fc.tuple(plausibleSpectrum, plausibleSpectrum, fc.double({ min: -90, max: 90, noNaN: true })).map(([a, b]) => {
      const f0 = a.length > 1 ? (a[1][1] as number) : 50;
      return [a, b.map((row) => [row[0], (row[0] as number) * f0, row[2], row[3]])];
    });
  }
  const v = spec.args.findIndex((a) => a.name === 'values');
  const l = spec.args.findIndex((a) => a.name === 'ladder');
  if (v >= 0 && l >= 0) {
    return each.chain((args) => valuesFor(args[l] as Grid).map((values) => args.map((a, i) => (i === v ? values : a))));
  }
  return each;
}

/**
 * Arguments for one call: all clean (half the calls), or one of them replaced by garbage, or each garbage
 * with probability 1/3; sometimes the last is left out (Excel passes null), sometimes one is added.
 */
function argsFor(spec: FunctionSpec): fc.Arbitrary<unknown[]> {
  const n = Math.max(1, spec.args.length);
  return fc
    .tuple(cleanArgs(spec), fc.nat(5), fc.nat(n - 1), fc.array(garbage, { minLength: n, maxLength: n }), fc.array(fc.nat(2), { minLength: n, maxLength: n }), fc.nat(5))
    .map(([clean, mode, idx, junk, coin, cut]) => {
      const list = [...clean];
      if (mode === 3 || mode === 4) list[idx % Math.max(1, list.length)] = junk[0];
      if (mode === 5) for (let i = 0; i < list.length; i++) if (coin[i] === 0) list[i] = junk[i];
      if (cut === 0) list.length = Math.max(0, list.length - 1);
      if (cut === 1) list.push(junk[n - 1]);
      return list;
    });
}

/* ---------------------------------------------------------------- the properties */

const CATCH_ALL = /could not compute a result|is not a finite number for these inputs/;

/** Why a call result breaks the contract, or undefined when it keeps it. */
function violation(spec: FunctionSpec, r: CallResult): string | undefined {
  if (!r.ok) {
    if (!['VALUE', 'NUM', 'NA'].includes(r.code)) return `error code ${r.code}`;
    if (typeof r.message !== 'string' || r.message.trim() === '') return 'empty message';
    if (r.message.length > 700) return `message of ${r.message.length} characters`;
    if (CATCH_ALL.test(r.message)) return `unexpected failure: ${r.message}`;
    return undefined;
  }
  const v = r.value;
  if (spec.result === 'number') return typeof v === 'number' && Number.isFinite(v) ? undefined : `not a finite number: ${String(v)}`;
  if (spec.result === 'text') return typeof v === 'string' ? undefined : `not a text: ${String(v)}`;
  if (!Array.isArray(v) || v.length === 0) return 'not a non-empty matrix';
  const width = Array.isArray(v[0]) ? v[0].length : -1;
  if (width < 1) return 'first row is empty';
  for (const row of v) {
    if (!Array.isArray(row) || row.length !== width) return 'ragged rows';
    for (const c of row) {
      if (typeof c === 'number' ? !Number.isFinite(c) : typeof c !== 'string') return `bad cell ${String(c)}`;
    }
  }
  return undefined;
}

/** Heavier functions (ladder solves, peak searches, spectra of many points) get fewer runs. */
const RUNS: Record<string, number> = {
  STRESS: 120, SPREAD: 120, RESPONSE: 150, PEAK: 150, VALLEY: 150, PKPK: 150, CREST: 150, TRACE: 150, PWL: 200, SAMPLED: 200,
};
const DEFAULT_RUNS = 300;

const outcomes: Record<string, { ok: number; VALUE: number; NUM: number; NA: number }> = {};
const messages: Record<string, string[]> = {};

describe('every function of the table keeps the error contract under random and garbage arguments', () => {
  test.each(FUNCTIONS.map((f) => [f.name, f] as const))('HC.%s', (name, spec) => {
    const count = (outcomes[name] = { ok: 0, VALUE: 0, NUM: 0, NA: 0 });
    fc.assert(
      fc.property(argsFor(spec), (args) => {
        let r: CallResult;
        try {
          r = invoke(spec, args);
        } catch (e) {
          throw new Error(`invoke threw: ${String(e)}`);
        }
        const why = violation(spec, r);
        if (why) throw new Error(why);
        count[r.ok ? 'ok' : r.code]++;
        if (!r.ok && process.env.HC_FUZZ_STATS) (messages[name] ??= []).push(r.message.replace(/[-0-9.e]+/g, '#').slice(0, 90));
      }),
      { seed: SEED, numRuns: runs(RUNS[spec.name] ?? DEFAULT_RUNS) },
    );
    // The generators must reach the computation, not only the argument checks.
    expect(count.ok).toBeGreaterThan(0.05 * runs(RUNS[spec.name] ?? DEFAULT_RUNS));
  });

  afterAll(() => {
    if (!process.env.HC_FUZZ_STATS) return;
    console.log(Object.entries(outcomes).map(([n, c]) => `${n} ${JSON.stringify(c)}`).join('\n'));
    for (const [n, list] of Object.entries(messages)) {
      const tally = new Map<string, number>();
      for (const m of list) tally.set(m, (tally.get(m) ?? 0) + 1);
      const top = [...tally].sort((a, b) => b[1] - a[1]).slice(0, 6);
      console.log(`${n}:\n${top.map(([m, c]) => `  ${c} × ${m}`).join('\n')}`);
    }
  });
});

/* ---------------------------------------------------------------- metamorphic: exact power-of-two scaling */

const call = (name: string, args: unknown[]): unknown => {
  const r = invoke(FUNCTION_BY_NAME.get(name)!, args);
  if (!r.ok) throw new Error(`${name}: ${r.message}`);
  return r.value;
};
const scaleAmplitudes = (g: Grid, k: number): Grid => g.map((row) => [row[0], row[1], (row[2] as number) * 2 ** k, row[3]]);

describe('scaling', () => {
  test('measures of a spectrum scale exactly with its amplitudes, from 2^-900 to 2^900', () => {
    fc.assert(
      fc.property(plausibleSpectrum, fc.integer({ min: -900, max: 900 }), (g, k) => {
        for (const name of ['MEAN', 'PEAK', 'VALLEY', 'PKPK', 'RMS']) {
          const base = call(name, [g]) as number;
          const scaled = call(name, [scaleAmplitudes(g, k)]) as number;
          const want = base * 2 ** k;
          if (!(Math.abs(scaled - want) <= 1e-13 * Math.abs(want) + 1e-300 * 2 ** k)) {
            throw new Error(`${name}: ${scaled} at 2^${k}, expected ${want}`);
          }
        }
        for (const name of ['CREST', 'THD']) {
          const a = invoke(FUNCTION_BY_NAME.get(name)!, [g]);
          const b = invoke(FUNCTION_BY_NAME.get(name)!, [scaleAmplitudes(g, k)]);
          if (a.ok !== b.ok || (a.ok && b.ok && Math.abs((a.value as number) - (b.value as number)) > 1e-12 * Math.abs(a.value as number))) {
            throw new Error(`${name} changed with the scale 2^${k}: ${JSON.stringify(a)} vs ${JSON.stringify(b)}`);
          }
        }
      }),
      { seed: SEED, numRuns: runs(60) },
    );
  });

  test('an impedance scales with R·a, L·a, C/a (a = 2^k), from pF-to-kH ladders to 2^±150', () => {
    const ladderOf = fc.array(
      fc.tuple(fc.constantFrom('series', 'shunt', '+', '||'), fc.constantFrom('R', 'L', 'C'), fc.integer({ min: -12, max: 3 })),
      { minLength: 1, maxLength: 8 },
    );
    fc.assert(
      fc.property(ladderOf, fc.integer({ min: -150, max: 150 }), fc.constantFrom(50, 1e3, 1e5, 1e7), (rows, k, f) => {
        rows[0][0] = rows[0][0] === '||' || rows[0][0] === '+' ? 'shunt' : rows[0][0];
        const base = rows.map(([role, kind, e]) => [role, kind, 10 ** e]);
        const scaled = rows.map(([role, kind, e]) => [role, kind, kind === 'C' ? 10 ** e / 2 ** k : 10 ** e * 2 ** k]);
        const a = invoke(FUNCTION_BY_NAME.get('IMPEDANCE')!, [base, f, 'rect']);
        const b = invoke(FUNCTION_BY_NAME.get('IMPEDANCE')!, [scaled, f, 'rect']);
        if (a.ok !== b.ok) throw new Error(`one failed: ${JSON.stringify(a)} / ${JSON.stringify(b)}`);
        if (!a.ok || !b.ok) return;
        const [[ar, ai]] = a.value as number[][];
        const [[br, bi]] = b.value as number[][];
        const mag = Math.hypot(ar, ai) * 2 ** k;
        if (!(Math.abs(br - ar * 2 ** k) <= 1e-9 * mag && Math.abs(bi - ai * 2 ** k) <= 1e-9 * mag)) {
          throw new Error(`Z = ${ar}+j${ai}; scaled by 2^${k}: ${br}+j${bi}`);
        }
      }),
      { seed: SEED, numRuns: runs(150) },
    );
  });
});

describe('a differential check', () => {
  test('the impedance of a resistor ladder is the fold of its series and parallel combinations (1e-12 to 1e12 Ω)', () => {
    const row = fc.tuple(fc.constantFrom('series', 'shunt', '+', '||'), fc.integer({ min: -12, max: 12 }), fc.double({ min: 1, max: 9.99, noNaN: true }));
    fc.assert(
      fc.property(fc.array(row, { minLength: 1, maxLength: 12 }), (rows) => {
        if (rows[0][0] === '+' || rows[0][0] === '||') rows[0][0] = 'shunt';
        const ladder = rows.map(([role, e, m]) => [role, 'R', m * 10 ** e]);
        // Branches: each starts at series/shunt; + adds in series, || across the branch built so far.
        const branches: { shunt: boolean; z: number }[] = [];
        for (const [role, , z] of ladder as [string, string, number][]) {
          if (role === 'series' || role === 'shunt') branches.push({ shunt: role === 'shunt', z });
          else if (role === '+') branches[branches.length - 1].z += z;
          else branches[branches.length - 1].z = 1 / (1 / branches[branches.length - 1].z + 1 / z);
        }
        let last = -1;
        branches.forEach((b, k) => (last = b.shunt ? k : last));
        const r = invoke(FUNCTION_BY_NAME.get('IMPEDANCE')!, [ladder, 1000, 'rect']);
        if (last < 0) {
          if (r.ok || !/nothing connects it to ground/.test(r.message)) throw new Error(`no path to ground: ${JSON.stringify(r)}`);
          return;
        }
        let z = branches[last].z;
        for (let k = last - 1; k >= 0; k--) z = branches[k].shunt ? 1 / (1 / branches[k].z + 1 / z) : branches[k].z + z;
        if (!r.ok) throw new Error(r.message);
        const [[re, im]] = r.value as number[][];
        if (!(Math.abs(re - z) <= 1e-12 * z && im === 0)) throw new Error(`Z = ${re} + j${im}, expected ${z}`);
      }),
      { seed: SEED, numRuns: runs(200) },
    );
  });
});

/* ---------------------------------------------------------------- the engine path */

/** A literal as formula text: numbers, quoted strings, TRUE/FALSE, omitted, or an array constant. */
const literal: fc.Arbitrary<string> = fc.oneof(
  fc.constantFrom('0', '1', '12', '-5', '0.5', '50', '1000', '250000', '1e308', '-1e308', '5e-324', '1e-12', '10000', '10001', '2.5'),
  fc.constantFrom('"4k7"', '"2u2"', '"full"', '"half"', '"rms"', '"pp"', '""', '"x"', '"constructor"', '"1e999"'),
  fc.constantFrom('TRUE', 'FALSE', ''),
  fc.constantFrom('{1;2;3}', '{0,0,1,0;1,50,1,0}', '{"series","R",1;"shunt","C","1u"}', '{1,2;3}', '1/0', 'NA()'),
);
const FORMULA_FUNCTIONS = ['PULSE', 'RAMP', 'SINE', 'RECTIFIED', 'VALUE', 'PREFERRED', 'ENG', 'RMS', 'IMPEDANCE', 'TRANSFER'];

describe('the headless engine path', () => {
  test('random literal arguments give a value or an error of a known kind, never an exception', () => {
    const hf = createEngine();
    fc.assert(
      fc.property(fc.constantFrom(...FORMULA_FUNCTIONS), fc.array(literal, { maxLength: 6 }), (name, args) => {
        const formula = `=HC.${name}(${args.join(', ')})`;
        const raw = hf.calculateFormula(engineFormula(formula), 0); // as hc eval reads it
        const values = Array.isArray(raw) ? raw.flat() : [raw];
        for (const v of values) {
          if (v instanceof DetailedCellError) {
            // #DIV/0!, #N/A and #REF! (a ragged array constant) come from the literals themselves, through the engine.
            if (!['#VALUE!', '#NUM!', '#N/A', '#DIV/0!', '#REF!'].includes(v.value)) throw new Error(`${formula}: ${v.value} ${v.message}`);
            if (/could not compute a result/.test(v.message ?? '')) throw new Error(`${formula}: ${v.message}`);
          } else if (typeof v === 'number' && !Number.isFinite(v)) {
            throw new Error(`${formula}: ${v}`);
          }
        }
      }),
      { seed: SEED, numRuns: runs(200) },
    );
    hf.destroy();
  });
});
