import { numError } from '../core/errors';
import { findElement, LadderTable, parseLadder, valuesFromGrid } from '../core/ladder';
import { ComplexArrays, impedance, transfer } from '../core/network';
import { response } from '../core/response';
import { LIMITS, networkWorkMessage } from '../core/limits';
import { checkLadderRange, harmonicSpan, positiveSpan } from '../core/ladder-range';
import { order, Spectrum, spectrumFromTable } from '../core/spectrum';
import { asChoice, asGrid, asNumber, asNumbers, asScalar, isBlank } from './coerce';
import { FunctionSpec } from './spec';
import { parseOnce } from './parse-memo';
import { spectral, SpectrumValue } from './spectral';

/** Shared argument readers for every function that takes a ladder. */
export const LADDER_HELP =
  'Ladder table: rows of role (series, shunt, +, ||), kind (R, L, C), value (e.g. 4u7), [tolerance %], [name].';
export const VALUES_HELP = 'Optional row or column with one value per ladder row, replacing the value column (a design case).';
export const SOURCE_HELP = '"voltage" (default: the spectrum is an ideal voltage source) or "current" (an ideal current source).';

export const ladderArg = (v: unknown): LadderTable => parseOnce(asGrid(v, 'ladder'), 'ladder', (g) => parseLadder(g, 'ladder'));
/** A spectrum table argument; `name` is the argument's name in messages. */
export const spectrumArg = (v: unknown, name = 'spectrum'): Spectrum =>
  v instanceof SpectrumValue ? v.spectrum : parseOnce(asGrid(v, name), 'spectrum', (g) => spectrumFromTable(g, name));
export const valuesArg = (v: unknown, table: LadderTable): Float64Array | undefined =>
  isBlank(v) ? undefined : valuesFromGrid(asGrid(v, 'values'), table, 'values');
export const sourceArg = (v: unknown) =>
  asChoice(v, 'source', { voltage: 'voltage', v: 'voltage', current: 'current', i: 'current' }, 'voltage' as const);
export const quantityArg = (v: unknown) =>
  asChoice(v, 'quantity', { v: 'V', voltage: 'V', i: 'I', current: 'I' }, 'V' as const);
export const elementArg = (v: unknown, table: LadderTable): number => findElement(table, asScalar(v, 'element'), 'element');

type Form = 'polar' | 'rect' | 'complex' | 'db';
const FORMS: Record<string, Form> = { polar: 'polar', rect: 'rect', rectangular: 'rect', complex: 'complex', db: 'db' };

function frequencies(v: unknown): Float64Array {
  if (!Array.isArray(v)) return Float64Array.of(asNumber(v, 'frequency'));
  return asNumbers(v, 'frequency', { blanks: 'trailing', max: LIMITS.sweep, maxWhat: 'frequencies' });
}

/** LIMITS.networkWork: ladder rows × frequencies (or harmonics + 1) solved in one call. */
export function checkNetworkWork(table: LadderTable, points: number, what: string): void {
  const message = networkWorkMessage(table.rows, points, what);
  if (message) throw numError(message);
}

/** Text a+bj that spreadsheet complex-number functions read (upper-case exponent, j suffix). */
function complexText(re: number, im: number): string {
  const num = (x: number): string => String(x + 0).replace('e', 'E');
  return `${num(re)}${im < 0 || Object.is(im, -0) ? '-' : '+'}${num(Math.abs(im))}j`;
}

function formatted(z: ComplexArrays, freqs: Float64Array, form: Form): (number | string)[][] {
  const rows: (number | string)[][] = new Array(z.re.length);
  for (let k = 0; k < z.re.length; k++) {
    const re = z.re[k], im = z.im[k];
    const mag = Math.hypot(re, im);
    const deg = mag > 0 ? (Math.atan2(im, re) * 180) / Math.PI : 0;
    if (form === 'rect') rows[k] = [re + 0, im + 0];
    else if (form === 'complex') rows[k] = [complexText(re, im)];
    else if (form === 'polar') rows[k] = [mag, deg + 0];
    else {
      if (mag === 0) throw numError(`the transfer is exactly 0 at ${freqs[k]} Hz, which has no value in dB (−∞); use form "polar".`);
      rows[k] = [20 * Math.log10(mag), deg + 0];
    }
  }
  return rows;
}

const FREQ_HELP = 'Frequency in Hz, or a column of frequencies for a sweep (one result row each).';

export const NETWORK_FUNCTIONS: FunctionSpec[] = [
  {
    name: 'IMPEDANCE',
    description: 'Impedance of the ladder seen by the source, at one frequency or a column of frequencies.',
    args: [
      { name: 'ladder', kind: 'range', help: LADDER_HELP },
      { name: 'frequency', kind: 'range', help: FREQ_HELP },
      { name: 'form', kind: 'text', help: '"polar" (default: magnitude Ω, phase deg), "rect" (real, imaginary) or "complex" (text a+bj).', optional: true },
      { name: 'values', kind: 'range', help: VALUES_HELP, optional: true },
    ],
    result: 'matrix',
    example: '=HC.IMPEDANCE(A2:C4, 100000)',
    impl: (ladder, f, form, values) => {
      const table = ladderArg(ladder);
      const freqs = frequencies(f);
      const fm = asChoice(form, 'form', { polar: 'polar', rect: 'rect', rectangular: 'rect', complex: 'complex' }, 'polar' as Form);
      checkNetworkWork(table, freqs.length, 'frequencies');
      const vals = valuesArg(values, table);
      checkLadderRange(table, ...positiveSpan(freqs), { values: vals });
      return formatted(impedance(table, freqs, vals), freqs, fm);
    },
  },
  {
    name: 'TRANSFER',
    description: 'Far-end voltage divided by source voltage, at one frequency or a column of frequencies.',
    args: [
      { name: 'ladder', kind: 'range', help: LADDER_HELP },
      { name: 'frequency', kind: 'range', help: FREQ_HELP },
      { name: 'form', kind: 'text', help: '"polar" (default: magnitude, phase deg), "db" (dB, phase deg), "rect" or "complex".', optional: true },
      { name: 'values', kind: 'range', help: VALUES_HELP, optional: true },
    ],
    result: 'matrix',
    example: '=HC.TRANSFER(A2:C4, 100000, "db")',
    impl: (ladder, f, form, values) => {
      const table = ladderArg(ladder);
      const freqs = frequencies(f);
      const fm = asChoice(form, 'form', FORMS, 'polar' as Form);
      checkNetworkWork(table, freqs.length, 'frequencies');
      const vals = valuesArg(values, table);
      checkLadderRange(table, ...positiveSpan(freqs), { values: vals });
      return formatted(transfer(table, freqs, vals), freqs, fm);
    },
  },
  spectral({
    name: 'RESPONSE',
    description:
      'Spectrum of a voltage or current in the ladder driven by a source spectrum: far-end voltage, source current, or one element’s voltage or current.',
    args: [
      { name: 'spectrum', kind: 'range', spectrum: true, help: 'Source spectrum table (rows n, frequency, amplitude, phase).' },
      { name: 'ladder', kind: 'range', help: LADDER_HELP },
      { name: 'quantity', kind: 'text', help: '"V" (default: far-end voltage, or the voltage across the element) or "I" (source current, or the current through the element).', optional: true },
      { name: 'element', kind: 'any', help: 'Element name (e.g. C2) or 1-based ladder row; omit for the far end / the source.', optional: true },
      { name: 'values', kind: 'range', help: VALUES_HELP, optional: true },
      { name: 'source', kind: 'text', help: SOURCE_HELP, optional: true },
    ],
    example: '=HC.RESPONSE(HC.PULSE(0, 12, 0.4, 250000, 50), A2:C4)',
    spectrum: (spec, ladder, quantity, element, values, source) => {
      const s = spectrumArg(spec);
      const table = ladderArg(ladder);
      checkNetworkWork(table, order(s) + 1, 'harmonics (n = 0…N)');
      const q = quantityArg(quantity);
      const el = elementArg(element, table);
      const vals = valuesArg(values, table);
      const src = sourceArg(source);
      checkLadderRange(table, ...harmonicSpan(s), { values: vals });
      return response(s, table, { quantity: q, element: el, values: vals, source: src });
    },
  }),
];
