/// <reference types="custom-functions-runtime" />
import type { ErrorCode } from '../core/errors';
import { invoke } from './invoke';
import { FUNCTION_BY_NAME } from './table';

/**
 * The Excel side of a call: the generated top-level functions (excel.generated.ts) hand their raw arguments
 * here; the table entry runs through invoke(), and an error result becomes a CustomFunctions.Error so the cell
 * shows #VALUE!, #NUM! or #N/A with our message. Nothing here throws: an uncaught exception would reach the
 * cell as a bare #VALUE! without a message.
 */

const EXCEL_CODE: Record<ErrorCode, 'invalidValue' | 'invalidNumber' | 'notAvailable'> = {
  VALUE: 'invalidValue',
  NUM: 'invalidNumber',
  NA: 'notAvailable',
};

/**
 * Call table entry `name` with the arguments Excel passed. `repeated` is the value of a repeating last
 * parameter: Excel passes all its occurrences as one array, which the table's impl receives spread out.
 */
export function excelCall(name: string, args: unknown[], repeated?: unknown): unknown {
  try {
    const spec = FUNCTION_BY_NAME.get(name);
    if (!spec) return excelError('NA', `HC.${name} is not in this add-in's function table.`);
    const all = repeated === undefined ? args : args.concat(Array.isArray(repeated) ? repeated : [repeated]);
    // Excel passes null for an omitted argument; undefined can only come from a shorter call, and means the same.
    const result = invoke(spec, all.map((a) => (a === undefined ? null : a)));
    return result.ok ? result.value : excelError(result.code, result.message);
  } catch (e) {
    return excelError('VALUE', `HC.${name} failed unexpectedly: ${e instanceof Error ? e.message : String(e)}`);
  }
}

/**
 * An Excel error value. Excel shows the message for #VALUE! and #N/A only; it is passed for #NUM! too, where
 * Excel drops it. Without the CustomFunctions.Error API (older hosts) the message itself is returned as text.
 */
export function excelError(code: ErrorCode, message: string): unknown {
  const cf = typeof CustomFunctions === 'undefined' ? undefined : CustomFunctions;
  if (cf === undefined || typeof cf.Error !== 'function' || cf.ErrorCode === undefined) return `#${code}: ${message}`;
  return new cf.Error(cf.ErrorCode[EXCEL_CODE[code]], message);
}

/** Register one generated function under its id; a host without the API is left alone rather than thrown at. */
export function associate(id: string, fn: (...args: never[]) => unknown): void {
  if (typeof CustomFunctions !== 'undefined' && typeof CustomFunctions.associate === 'function') {
    CustomFunctions.associate(id, fn);
  }
}
