/**
 * The shape of one entry of the function table. The table (table.ts) is the single source from which the
 * Excel adapter (generated top-level functions + JSDoc metadata) and the headless engine are both built.
 */
export type ArgKind =
  | 'number'   // one number (numeric text and engineering text such as 4k7 or 20 kHz accepted)
  | 'integer'  // one whole number
  | 'text'     // one text choice or code
  | 'bool'     // TRUE/FALSE
  | 'any'      // one value of any type (a number or a text such as an element name)
  | 'range';   // a range or nested array (spectrum, ladder, sweep column, values override)

export interface ArgSpec {
  name: string;          // snake_case, as shown in Excel's formula help
  kind: ArgKind;
  help: string;          // one line shown in the argument tooltip
  optional?: boolean;
  repeating?: boolean;   // only the last argument; Excel repeating parameter (HC.COMBINE)
  /**
   * A range read as a spectrum table (through spectrumArg). The headless engine may then pass it the Spectrum
   * a nested call computed, without writing and re-reading its table (spectral.ts).
   */
  spectrum?: boolean;
}

import type { Spectrum } from '../core/spectrum';

export type Returned = number | string | boolean | (number | string)[][];

export interface FunctionSpec {
  name: string;          // id without namespace, upper case (HC.<name>)
  description: string;   // one or two sentences shown in Excel's function help
  args: ArgSpec[];
  result: 'number' | 'text' | 'matrix';
  example: string;       // a formula a user can paste, used by the help page and docs
  /** The implementation: receives raw adapter values (null for omitted), coerces them, calls the core. */
  impl: (...args: unknown[]) => Returned;
  /** For a function whose result is a spectrum table: the spectrum itself (impl writes its table). */
  spectrum?: (...args: unknown[]) => Spectrum;
}
