import { Spectrum, spectrumToTable } from '../core/spectrum';
import { FunctionSpec } from './spec';

/**
 * Spectra passed between nested calls without their tables.
 *
 * A spectrum-producing function (HC.PULSE, HC.RESPONSE, …) is defined by the Spectrum it computes; its impl
 * writes that spectrum's table, which is what Excel receives. An adapter that sees a whole formula (the
 * headless engine) may instead hand the Spectrum straight to an argument marked `spectrum` of the enclosing
 * call, wrapped in a SpectrumValue: =HC.RMS(HC.RESPONSE(…)) then neither writes 201 rows of amplitude and
 * phase nor parses them back (the phasors arrive exact, where the table round trip rounds them in the last
 * bit or so). Every reader of such an argument goes through spectrumArg, which takes either form.
 */
export class SpectrumValue {
  constructor(readonly spectrum: Spectrum) {}
  /** The table the producing function's impl would have returned. */
  table(): number[][] {
    return spectrumToTable(this.spectrum);
  }
}

/** A table entry whose result is a spectrum: `impl` is derived from `spectrum`. */
export function spectral(def: Omit<FunctionSpec, 'impl' | 'result'> & { spectrum: (...args: unknown[]) => Spectrum }): FunctionSpec {
  const compute = def.spectrum;
  return { ...def, result: 'matrix', impl: (...args: unknown[]) => spectrumToTable(compute(...args)) };
}
