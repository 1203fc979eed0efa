import { HcError, naError, numError, valueError } from './errors';
import { describeElement, LadderTable } from './ladder';
import {
  batchBuffers, describeFrequency, I_UNBOUNDED, LadderSolver, makeSolution, PortBatch, scratchSolution, Solution, SourceKind, V_UNBOUNDED,
} from './network';
import { makeSpectrum, order, Spectrum } from './spectrum';

/**
 * Response spectra of a ladder driven by a periodic source (DESIGN §3 HC.RESPONSE, and the per-element data
 * behind HC.STRESS): the ladder is solved for a unit source at every harmonic n·f0 and each result phasor is
 * the source phasor times that unit response (superposition).
 *
 * Sign conventions (see network.ts Solution): element current from the source side to the far side (series
 * branches) or from the node to ground (shunt branches); element voltage is the drop in that direction, so
 * v·i > 0 means the element absorbs power. The source current flows out of the voltage source into node 1;
 * a current source pushes its current into node 1.
 *
 * A harmonic where the source phasor is exactly 0 contributes 0 without solving the network there, so a
 * source with no DC content may drive a network that is singular at DC (a current source into capacitors).
 */

export type Quantity = 'V' | 'I';

export interface ResponseOptions {
  /** 'V' (default): far-end voltage, or the voltage across the element; 'I': source current, or the element's. */
  quantity?: Quantity;
  /** 0-based ladder row; −1 or undefined for the default (far end / source). */
  element?: number;
  /** 'voltage' (default): the spectrum is the source voltage; 'current': it is a current pushed into node 1. */
  source?: SourceKind;
  /** One value per ladder row replacing the value column (DESIGN §2 values override). */
  values?: ArrayLike<number>;
}

function checkSpectrum(spec: Spectrum): void {
  const N = order(spec);
  if (spec.im.length !== spec.re.length) throw valueError('spectrum: the re and im arrays must have the same length.');
  if (!(spec.f0 >= 0 && spec.f0 < Infinity) || (N > 0 && spec.f0 === 0)) {
    throw numError(`spectrum: the fundamental must be a finite frequency > 0 Hz, got ${spec.f0}.`);
  }
}

function checkSource(source: unknown): SourceKind {
  if (source === undefined || source === 'voltage' || source === 'current') return source ?? 'voltage';
  throw valueError(`source must be 'voltage' or 'current', got ${JSON.stringify(source)}.`);
}

/** Why a requested quantity has no finite value, and what would give it one. */
function unbounded(
  table: LadderTable,
  solver: LadderSolver,
  source: SourceKind,
  n: number,
  f0: number,
  what: 'source' | 'far' | { row: number; q: Quantity },
): HcError {
  const f = n * f0;
  const at = n === 0 ? 'DC (harmonic 0)' : `harmonic ${n} (${describeFrequency(f)})`;
  if (source === 'current' && solver.lastShunt < 0) {
    return numError('the ladder has no path to ground, so an ideal current source cannot drive it; add a shunt element.');
  }
  const cure = 'add the parts\u2019 ESR/DCR or a damping resistor';
  if (what === 'source') {
    if (source === 'voltage') {
      const why = n === 0 ? 'an inductor path to ground' : 'loss-free resonance';
      return numError(`the ladder is a short circuit at ${at} (${why}): the source current is unbounded; ${cure}, or a series resistance.`);
    }
    const why = n === 0 ? 'only capacitors to ground' : 'loss-free resonance';
    return numError(`the ladder is an open circuit at ${at} (${why}): the current source's voltage is unbounded; ${cure}, or a resistor to ground.`);
  }
  const why = n === 0 ? 'at DC inductors are short circuits and capacitors open circuits' : 'a loss-free resonance lands exactly on it';
  const subject = what === 'far' ? 'the far-end voltage' : `the ${what.q === 'V' ? 'voltage across' : 'current through'} ${describeElement(table, what.row)}`;
  return numError(`${subject} is unbounded at ${at} with an ideal ${source} source (${why}); ${cure}.`);
}

/** DESIGN §3 HC.RESPONSE: the spectrum of one voltage or current, on the same f0 and N as the source. */
export function response(spec: Spectrum, table: LadderTable, opts: ResponseOptions = {}): Spectrum {
  checkSpectrum(spec);
  const source = checkSource(opts.source);
  const quantity = opts.quantity ?? 'V';
  if (quantity !== 'V' && quantity !== 'I') throw valueError(`quantity must be V or I, got ${JSON.stringify(quantity)}.`);
  const element = opts.element ?? -1;
  if (!Number.isInteger(element) || element < -1 || element >= table.rows) {
    throw naError(`element ${element + 1} is not in the ladder; use rows 1 to ${table.rows}.`);
  }
  const solver = new LadderSolver(table, opts.values);
  const out = makeSpectrum(spec.f0, order(spec));
  const failed = responseInto(spec, solver, quantity, element, source, out);
  if (failed >= 0) {
    throw unbounded(table, solver, source, failed, spec.f0, element >= 0 ? { row: element, q: quantity } : quantity === 'V' ? 'far' : 'source');
  }
  return out;
}

/**
 * The response loop behind response() and each case of a tolerance spread: writes every harmonic of `out`
 * (same f0 and N as `spec`) for the solver's present values. Returns −1, or the first harmonic where the
 * quantity is unbounded (the caller words the error). Arguments are trusted: response() validates them.
 */
export function responseInto(
  spec: Spectrum,
  solver: LadderSolver,
  quantity: Quantity,
  element: number,
  source: SourceKind,
  out: Spectrum,
  sol?: Solution,
): number {
  const N = order(spec);
  // Port quantities (far end, source) for all harmonics n ≥ 1 in one batched pass; the rest one at a time.
  const batch = element < 0 ? harmonicBatch(solver, spec, source) : undefined;
  for (let n = 0; n <= N; n++) {
    const cr = spec.re[n], ci = n === 0 ? 0 : spec.im[n];
    if (cr === 0 && ci === 0) {
      out.re[n] = 0;
      out.im[n] = 0;
      continue;
    }
    let qr: number, qi: number, ok: boolean;
    if (batch && n >= 1 && batch.ok[n - 1]) {
      if (quantity === 'V') {
        qr = batch.fRe[n - 1];
        qi = batch.fIm[n - 1];
      } else if (source === 'voltage') {
        qr = batch.sRe[n - 1];
        qi = batch.sIm[n - 1];
      } else {
        qr = 1;
        qi = 0;
      }
      out.re[n] = cr * qr - ci * qi;
      out.im[n] = cr * qi + ci * qr;
      continue;
    }
    sol ??= scratchSolution(solver.table); // only for harmonics the batched pass leaves to solve()
    solver.solve(n * spec.f0, source, sol, element >= 0);
    if (element >= 0) {
      const bad = sol.bad[element] & (quantity === 'V' ? V_UNBOUNDED : I_UNBOUNDED);
      ok = bad === 0;
      qr = quantity === 'V' ? sol.vRe[element] : sol.iRe[element];
      qi = quantity === 'V' ? sol.vIm[element] : sol.iIm[element];
    } else if (quantity === 'V') {
      ok = !sol.portBad[1];
      qr = sol.port[2];
      qi = sol.port[3];
    } else if (source === 'voltage') {
      ok = !sol.portBad[0];
      qr = sol.port[0];
      qi = sol.port[1];
    } else {
      // The current source's own current is the spectrum itself; a ladder it cannot drive is still an error.
      ok = solver.lastShunt >= 0;
      qr = 1;
      qi = 0;
    }
    if (!ok) return n;
    out.re[n] = cr * qr - ci * qi;
    out.im[n] = n === 0 ? 0 : cr * qi + ci * qr;
  }
  return -1;
}

/** portsBatch at the harmonics n = 1…N of a spectrum (slot n − 1), frequencies formed as solve(n·f0) forms them. */
function harmonicBatch(solver: LadderSolver, spec: Spectrum, source: SourceKind): PortBatch {
  const N = order(spec);
  const { w, batch } = batchBuffers(N);
  for (let n = 1; n <= N; n++) {
    const f = n * spec.f0;
    w[n - 1] = 2 * Math.PI * f;
  }
  solver.portsBatch(w, N, source, batch);
  return batch;
}

/**
 * Every element's voltage and current spectrum in one pass over the harmonics. Matrices are row-major,
 * rows × (harmonics + 1): element r, harmonic n at index r·(harmonics + 1) + n; phasors in the Spectrum
 * convention. Memory is 32·rows·(N + 1) bytes for the four matrices.
 */
export interface ElementSpectra {
  f0: number;
  harmonics: number;
  rows: number;
  vRe: Float64Array;
  vIm: Float64Array;
  iRe: Float64Array;
  iIm: Float64Array;
  /** Source current (voltage source) or source voltage (current source). */
  source: Spectrum;
  /** Far-end voltage. */
  far: Spectrum;
}

export function elementResponses(
  spec: Spectrum,
  table: LadderTable,
  opts: { source?: SourceKind; values?: ArrayLike<number> } = {},
): ElementSpectra {
  checkSpectrum(spec);
  const source = checkSource(opts.source);
  const solver = new LadderSolver(table, opts.values);
  const sol: Solution = makeSolution(table);
  const N = order(spec);
  const stride = N + 1;
  const size = table.rows * stride;
  const res: ElementSpectra = {
    f0: spec.f0, harmonics: N, rows: table.rows,
    vRe: new Float64Array(size), vIm: new Float64Array(size), iRe: new Float64Array(size), iIm: new Float64Array(size),
    source: makeSpectrum(spec.f0, N), far: makeSpectrum(spec.f0, N),
  };
  for (let n = 0; n <= N; n++) {
    const cr = spec.re[n], ci = n === 0 ? 0 : spec.im[n];
    if (cr === 0 && ci === 0) continue;
    solver.solve(n * spec.f0, source, sol, true);
    if (sol.portBad[0]) throw unbounded(table, solver, source, n, spec.f0, 'source');
    if (sol.portBad[1]) throw unbounded(table, solver, source, n, spec.f0, 'far');
    for (let r = 0; r < table.rows; r++) {
      const bad = sol.bad[r];
      if (bad) throw unbounded(table, solver, source, n, spec.f0, { row: r, q: bad & V_UNBOUNDED ? 'V' : 'I' });
      const at = r * stride + n;
      res.vRe[at] = cr * sol.vRe[r] - ci * sol.vIm[r];
      res.vIm[at] = cr * sol.vIm[r] + ci * sol.vRe[r];
      res.iRe[at] = cr * sol.iRe[r] - ci * sol.iIm[r];
      res.iIm[at] = cr * sol.iIm[r] + ci * sol.iRe[r];
    }
    res.source.re[n] = cr * sol.port[0] - ci * sol.port[1];
    res.source.im[n] = cr * sol.port[1] + ci * sol.port[0];
    res.far.re[n] = cr * sol.port[2] - ci * sol.port[3];
    res.far.im[n] = cr * sol.port[3] + ci * sol.port[2];
  }
  return res;
}
