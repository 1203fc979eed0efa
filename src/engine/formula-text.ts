/**
 * Formula text as saved in .xlsx files versus as the engine reads it.
 *
 * Saved files carry prefixes the engine does not know: add-in (JavaScript custom) functions are saved as
 * `_xldudf_HC.PULSE(` (sometimes `[2]!_xldudf_…` after an add-in mix-up), functions newer than the file
 * format as `_xlfn.XLOOKUP(`, worksheet-only ones as `_xlfn._xlws.FILTER(`, LET/LAMBDA parameters as
 * `_xlpm.x`, XLL functions as `_xll.`. Only text outside string literals is touched.
 */

const SAVED_PREFIX = /(?:\[\d+\]!)?_xldudf_|_xlfn\.(?:_xlws\.)?|_xlws\.|_xlpm\.|_xll\./gi;
/** Number literals with an upper-case exponent (1E-6): Excel writes them so, the engine's lexer wants `e`. */
const UPPER_EXPONENT = /(?<![A-Za-z0-9_.$])(\d+(?:\.\d*)?|\.\d+)E([+-]?\d)/g;
/** Excel's boolean literals; the engine knows them only as the functions TRUE() and FALSE(). */
const BOOLEAN_LITERAL = /(?<![A-Za-z0-9_.!$'\]])(TRUE|FALSE)(?![A-Za-z0-9_.!(]|\s*\()/gi;
/** An add-in function saved without its namespace dot (HC_PULSE). */
const UNDOTTED_HC = /_xldudf_HC_([A-Z][A-Z0-9_]*)\s*\(/gi;

/** Apply `fn` to the parts of a formula outside double-quoted string literals ("" is an escaped quote). */
export function mapOutsideStrings(formula: string, fn: (code: string) => string): string {
  let out = '';
  let i = 0;
  while (i < formula.length) {
    const q = formula.indexOf('"', i);
    if (q < 0) {
      out += fn(formula.slice(i));
      break;
    }
    out += fn(formula.slice(i, q));
    // Copy the literal, through its closing quote ("" inside it is an escaped quote).
    let j = q + 1;
    for (;;) {
      const close = formula.indexOf('"', j);
      if (close < 0) {
        j = formula.length;
        break;
      }
      if (formula[close + 1] === '"') {
        j = close + 2;
        continue;
      }
      j = close + 1;
      break;
    }
    out += formula.slice(q, j);
    i = j;
  }
  return out;
}

/** Formula text from a saved file, as a person reads it: leading "=", saved-file prefixes removed. */
export function normaliseFormula(stored: string): string {
  const body = stored.startsWith('=') ? stored.slice(1) : stored;
  const clean = mapOutsideStrings(body, (code) =>
    code.replace(UNDOTTED_HC, (_m, name: string) => `HC.${name.toUpperCase()}(`).replace(SAVED_PREFIX, ''),
  );
  return `=${clean}`;
}

/**
 * Formula text as the engine reads it: normaliseFormula, then the spellings HyperFormula's parser wants
 * where Excel's differ: `1E-6` → `1e-6`, and the literals TRUE/FALSE → TRUE()/FALSE().
 */
export function engineFormula(text: string): string {
  return mapOutsideStrings(normaliseFormula(text), (code) =>
    code
      .replace(UPPER_EXPONENT, (_m, mantissa: string, exp: string) => `${mantissa}e${exp}`)
      .replace(BOOLEAN_LITERAL, (_m, word: string) => `${word.toUpperCase()}()`),
  );
}

/**
 * Built-in functions that Excel saves with `_xlfn.` (introduced after the 2007 file format), for the ones
 * a design workbook is likely to use. FILTER/SORT/… also carry `_xlws.`.
 */
const XLFN = new Set([
  'IFS', 'SWITCH', 'MAXIFS', 'MINIFS', 'CONCAT', 'TEXTJOIN', 'XOR', 'IFNA', 'XLOOKUP', 'XMATCH', 'SEQUENCE',
  'UNIQUE', 'RANDARRAY', 'LET', 'STDEV.S', 'STDEV.P', 'VAR.S', 'VAR.P', 'CEILING.MATH', 'FLOOR.MATH', 'ERF.PRECISE',
  'NORM.DIST', 'NORM.INV', 'NORM.S.DIST', 'NORM.S.INV', 'COT', 'SEC', 'CSC', 'ACOT', 'DAYS', 'ISOWEEKNUM',
]);
const XLWS = new Set(['FILTER', 'SORT']);

/**
 * Formula text as Excel stores it in a file: HC functions as `_xldudf_HC.NAME(`, newer built-ins with
 * `_xlfn.`, no leading "=". Used to write workbooks that look like ones Excel saved.
 */
export function toStoredFormula(formula: string): string {
  const body = formula.startsWith('=') ? formula.slice(1) : formula;
  return mapOutsideStrings(body, (code) =>
    code.replace(/(?<![A-Za-z0-9_.])([A-Za-z][A-Za-z0-9_.]*)(\s*\()/g, (m, name: string, paren: string) => {
      const upper = name.toUpperCase();
      if (upper.startsWith('HC.')) return `_xldudf_${upper}${paren}`;
      if (XLWS.has(upper)) return `_xlfn._xlws.${upper}${paren}`;
      if (XLFN.has(upper)) return `_xlfn.${upper}${paren}`;
      return m;
    }),
  );
}
