import { ConfigParams, HyperFormula, SerializedNamedExpression, Sheets } from 'hyperformula';
import { FUNCTIONS } from '../functions/table';
import { FunctionSpec } from '../functions/spec';
import { EngineContext, isEngineContext, newContext, parseAddressKey } from './context';
import { engineFormula } from './formula-text';
import { buildPlugin } from './plugin';

/**
 * The one place a headless workbook engine is built: HyperFormula with the HC function table registered.
 *
 * HyperFormula is used under its GPLv3 licence (key `gpl-v3`); it is a dependency of the engine and the
 * command line only and is never bundled into the Excel add-in.
 */

/**
 * Engine settings. `smartRounding: false` stops HyperFormula rounding exported numbers to
 * `precisionRounding` (10) significant digits and its epsilon snapping in comparisons and sums, so
 * results come back at full double precision, as the core computed them (and `=A1=B1` is exact, as in
 * Excel's own comparison of stored doubles). Array arithmetic on, as in a dynamic-array spreadsheet.
 * Empty references in a cell read as 0, as a spreadsheet shows them.
 */
export const ENGINE_CONFIG: Partial<ConfigParams> = {
  licenseKey: 'gpl-v3',
  smartRounding: false,
  useArrayArithmetic: true,
  evaluateNullToZero: true,
  functionArgSeparator: ',',
  decimalSeparator: '.',
  arrayColumnSeparator: ',',
  arrayRowSeparator: ';',
  maxRows: 1_048_576,
  maxColumns: 16_384,
  // No undo history: nothing here undoes an edit, and recording one cost each edit ~10 % of a recalculation.
  undoLimit: 0,
};

let registered: readonly FunctionSpec[] | undefined;

/** Register the function table with HyperFormula (a process-wide registry); idempotent. */
export function registerFunctions(functions: readonly FunctionSpec[] = FUNCTIONS): void {
  if (registered === functions) return;
  if (registered) throw new Error('A different function table is already registered with HyperFormula.');
  const { plugin, translations } = buildPlugin(functions);
  HyperFormula.registerFunctionPlugin(plugin, translations);
  registered = functions;
}

export interface EngineOptions {
  /** Workbook-level names, e.g. { name: 'ripple_pp', expression: '=Results!$B$2' }. */
  namedExpressions?: SerializedNamedExpression[];
  /** Extra HyperFormula settings (merged over ENGINE_CONFIG). */
  config?: Partial<ConfigParams>;
  /** Called after each computed table call (progress reporting). */
  onCall?: (name: string) => void;
}

/**
 * Build an engine from sheets ({ name: rows of raw cell contents }) or an empty one with a sheet
 * named Sheet1. Spilled HC results whose size depends on other cells are sized after the first
 * evaluation (settleSpills), so they spill to their actual size.
 */
export function createEngine(sheets?: Sheets, options: EngineOptions = {}): HyperFormula {
  registerFunctions();
  const context = newContext();
  context.onCall = options.onCall;
  const config = { ...ENGINE_CONFIG, ...options.config, context };
  context.building = true;
  let hf: HyperFormula;
  try {
    hf = HyperFormula.buildFromSheets(normaliseSheets(sheets ?? { Sheet1: [] }), config, options.namedExpressions ?? []);
  } finally {
    context.building = false;
  }
  settleSpills(hf);
  return hf;
}

/** Formulas as the engine reads them (engineFormula), other cells untouched. */
function normaliseSheets(sheets: Sheets): Sheets {
  const out: Sheets = {};
  for (const [name, rows] of Object.entries(sheets)) {
    // Array.from also turns holes of sparse rows into explicit blanks.
    out[name] = Array.from(rows, (row) =>
      Array.from(row ?? [], (c) => (c === undefined ? null : typeof c === 'string' && c.startsWith('=') ? engineFormula(c) : c)),
    );
  }
  return out;
}

/** The engine context of an engine built by createEngine. */
export function engineContext(hf: HyperFormula): EngineContext {
  const c = hf.getConfig().context;
  if (!isEngineContext(c)) throw new Error('This HyperFormula instance was not built by createEngine.');
  return c;
}

/**
 * Re-read formulas whose spill size was provisional or has changed (HyperFormula fixes a spill's size
 * when it reads a formula). Call after edits through the HyperFormula API that change a harmonic count
 * or a table length; createEngine calls it once after building. Each pass fixes one level of spills
 * that feed spills; it stops when nothing is pending or a pass makes no progress.
 * Returns the count of formulas that are still pending (they show a #VALUE! saying why).
 */
export function settleSpills(hf: HyperFormula, maxPasses = 32): number {
  const ctx = engineContext(hf);
  let previous = '';
  for (let pass = 0; pass < maxPasses && ctx.pending.size > 0; pass++) {
    const keys = [...ctx.pending.keys()].sort();
    const signature = keys.join('|');
    if (signature === previous) break;
    previous = signature;
    ctx.pending.clear();
    // Suspended evaluation rather than hf.batch: one batch's undo entry is rescanned on every edit inside
    // it (HyperFormula's undo clean-up), which made re-reading 10,000 formulas take tens of seconds.
    const suspended = hf.isEvaluationSuspended();
    if (!suspended) hf.suspendEvaluation();
    try {
      for (const key of keys) {
        const address = parseAddressKey(key);
        if (hf.getSheetName(address.sheet) === undefined) continue;
        const formula = hf.getCellFormula(address);
        if (formula !== undefined) hf.setCellContents(address, [[formula]]);
      }
    } finally {
      if (!suspended) hf.resumeEvaluation();
    }
  }
  return ctx.pending.size;
}
