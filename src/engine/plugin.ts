import {
  ArraySize,
  CellError,
  ErrorType,
  FunctionArgument,
  FunctionArgumentType,
  FunctionMetadata,
  FunctionPlugin,
  FunctionPluginDefinition,
  ImplementedFunctions,
  SimpleCellAddress,
  SimpleRangeValue,
} from 'hyperformula';
import { invoke, invokeSpectrum } from '../functions/invoke';
import { FunctionSpec } from '../functions/spec';
import { addressKey, EngineContext, isEngineContext, memoised, newContext, recordPrediction } from './context';
import { callKey } from './memo-key';
import { ErrorArgument, fromResult, fromSpectrumResult, Plain, PlainCell, RANGE_CACHE_KEY, RangeCache, sizeOf, toPlain } from './values';

/**
 * The function table as a HyperFormula function plugin: one `HC.<NAME>` entry per FunctionSpec, built
 * generically from the argument kinds, so the engine cannot drift from the Excel adapter.
 *
 * HyperFormula's lexer accepts dots inside function names (letters, digits, `_` and `.` after a first
 * letter), so `HC.PULSE` is registered as the function id itself, with an identity translation.
 */

/** The parts of HyperFormula's AST and interpreter state this module reads (not exported by the package). */
interface CallNode {
  type: string;
  procedureName: string;
  args: unknown[];
}
interface EvalState {
  formulaAddress: SimpleCellAddress;
  arraysFlag: boolean;
}

export const NAMESPACE = 'HC';
export const functionId = (spec: FunctionSpec): string => `${NAMESPACE}.${spec.name}`;

const REFERENCE_NODES = new Set(['CELL_REFERENCE', 'CELL_RANGE', 'COLUMN_RANGE', 'ROW_RANGE', 'NAMED_EXPRESSION']);

/** Whether an AST subtree reads any cell or name (its value is unknown while the workbook is being built). */
export function readsCells(node: unknown): boolean {
  if (Array.isArray(node)) return node.some(readsCells);
  if (typeof node !== 'object' || node === null) return false;
  const n = node as { type?: unknown } & Record<string, unknown>;
  if (typeof n.type === 'string' && REFERENCE_NODES.has(n.type)) return true;
  for (const key of ['args', 'left', 'right', 'value', 'expression']) {
    if (key in n && readsCells(n[key])) return true;
  }
  return false;
}

/**
 * HyperFormula argument metadata for a spec's arguments. Ranges stay ranges; other kinds are passed
 * through untouched (SCALAR/ANY) because the table's coercion reads engineering text such as "4k7",
 * which HyperFormula's NUMBER coercion would reject. Matrix results are never vectorised (their size is
 * the call's own); scalar functions take SCALAR arguments, so a range given for a scalar argument is
 * lifted element-wise as in a dynamic-array spreadsheet.
 */
function parametersOf(spec: FunctionSpec): { parameters: FunctionArgument[]; repeatLastArgs?: number } {
  const matrix = spec.result === 'matrix';
  const parameters = spec.args.map(
    (a): FunctionArgument => ({
      argumentType:
        a.kind === 'range' ? FunctionArgumentType.RANGE : matrix ? FunctionArgumentType.ANY : FunctionArgumentType.SCALAR,
      // Every argument is optional here: a missing one reaches the table's coercion, whose message names it.
      optionalArg: true,
    }),
  );
  const last = spec.args[spec.args.length - 1];
  return last?.repeating ? { parameters, repeatLastArgs: 1 } : { parameters };
}

/** Argument types whose value's size never sets the size of the call's result (HyperFormula's own rule). */
const UNSIZED = new Set<FunctionArgumentType>([FunctionArgumentType.RANGE, FunctionArgumentType.ANY]);

const isOmitted = (node: unknown): boolean => (node as { type?: unknown } | undefined)?.type === 'EMPTY';

const methodName = (spec: FunctionSpec): string => `hc_${spec.name.toLowerCase()}`;
const sizeMethodName = (spec: FunctionSpec): string => `hc_${spec.name.toLowerCase()}_size`;

/** Base class holding the generic call and size logic; one subclass per function table. */
export abstract class HcFunctionPlugin extends FunctionPlugin {
  private ownContext?: EngineContext;

  protected get hc(): EngineContext {
    const c = this.config.context;
    if (isEngineContext(c)) return c;
    return (this.ownContext ??= newContext());
  }

  /** Evaluate the arguments (HyperFormula checks their count and propagates scalar errors) and call the spec. */
  protected compute(spec: FunctionSpec, node: CallNode, state: EvalState): unknown {
    const metadata = this.metadata(functionId(spec));
    // runFunction's parameter types are internal to HyperFormula; the shapes are those it passes itself.
    const run = this.runFunction as unknown as (a: unknown[], s: EvalState, m: FunctionMetadata, f: (...v: unknown[]) => unknown) => unknown;
    const ctx = this.hc;
    ctx.depth++;
    try {
      // depth > 1 here: this call is an argument of another HC call, which only reads its result.
      const nested = ctx.depth > 1;
      return run(node.args, state, metadata, (...values: unknown[]) => this.callTable(spec, values, nested, node.args));
    } finally {
      ctx.depth--;
    }
  }

  /** Converted range values kept in HyperFormula's range vertices (see RangeCache in values.ts). */
  private readonly rangeCache: RangeCache = {
    get: (v) => {
      const vertex = this.rangeVertex(v);
      const rows = vertex?.getFunctionValue(RANGE_CACHE_KEY) as unknown as PlainCell[][] | undefined;
      if (rows) this.hc.rangeCacheHits++;
      return rows;
    },
    set: (v, rows) => this.rangeVertex(v)?.setFunctionValue(RANGE_CACHE_KEY, rows as never),
  };

  private rangeVertex(v: SimpleRangeValue) {
    const range = v.range;
    return range ? this.dependencyGraph.getRange(range.start, range.end) : undefined;
  }

  private callTable(spec: FunctionSpec, values: unknown[], nested: boolean, argNodes: readonly unknown[]): unknown {
    let args: Plain[];
    const ctx = this.hc;
    // Not while a size method runs: at parse time the cells may still hold values from before an edit.
    const cache = ctx.sizing > 0 ? undefined : this.rangeCache;
    try {
      args = new Array(values.length);
      for (let k = 0; k < values.length; k++) {
        // An omitted argument (`=HC.RESPONSE(s, l, , , , "current")`) is null, as Excel passes it; HyperFormula
        // would hand a range argument over as a range of one blank cell.
        // Past the declared arguments the last one repeats (HC.COMBINE), spectrum mark included.
        const spectrum = spec.args[Math.min(k, spec.args.length - 1)]?.spectrum === true;
        args[k] = isOmitted(argNodes[k]) ? null : toPlain(values[k], cache, spectrum);
      }
    } catch (e) {
      if (e instanceof ErrorArgument) return e.error;
      throw e;
    }
    // Keyed only when the memo could answer or will store (see EngineContext.memo): hashing costs microseconds.
    const key = spec.result === 'matrix' && (ctx.remember > 0 || ctx.memoCount.has(spec.name)) ? callKey(spec.name, args) : undefined;
    const counted = <R>(call: () => R) => (): R => {
      const r = call();
      ctx.onCall?.(spec.name);
      return r;
    };
    // A spectrum is kept as it is: an enclosing HC call takes it so; a cell or another function gets its table.
    if (spec.spectrum) return fromSpectrumResult(memoised(ctx, key, args, counted(() => invokeSpectrum(spec, args))));
    return fromResult(memoised(ctx, key, args, counted(() => invoke(spec, args))), !nested);
  }

  /** The method HyperFormula calls to evaluate `HC.<NAME>(…)`. */
  evaluateCall(spec: FunctionSpec, node: CallNode, state: EvalState): unknown {
    if (spec.result !== 'matrix') return this.compute(spec, node, state);
    const ctx = this.hc;
    const where = addressKey(state.formulaAddress);
    const predicted = ctx.predicted.get(node)?.get(where);
    // A provisionally sized formula is sized again by settleSpills: keep this result for that.
    if (predicted?.provisional) ctx.remember++;
    let value: unknown;
    try {
      value = this.compute(spec, node, state);
    } finally {
      if (predicted?.provisional) ctx.remember--;
    }
    if (value instanceof CellError || !predicted) return value;
    const got = sizeOf(value);
    if (got.rows === predicted.rows && got.cols === predicted.cols) return value;
    // The engine would silently cut or pad the result to the size it fixed when reading the formula.
    this.hc.pending.set(where, predicted.provisional ?? 'its size changed since the formula was read');
    const why = predicted.provisional
      ? `its size was not known when the formula was read (${predicted.provisional})`
      : 'its size changed since the formula was read (an argument such as the harmonic count or a table length changed)';
    return new CellError(
      ErrorType.VALUE,
      `${functionId(spec)}: the result is ${got.rows} × ${got.cols} but the spill area was fixed at ${predicted.rows} × ${predicted.cols}, ` +
        `because ${why}. The headless engine fixes a spill's size when it reads a formula; settleSpills() (run by createEngine and hc) re-reads it.`,
    );
  }

  /** The sizeOfResultArrayMethod: the size of the call's actual result, computed once and memoised. */
  sizeOfCall(spec: FunctionSpec, node: CallNode, state: EvalState): ArraySize {
    const ctx = this.hc;
    const where = addressKey(state.formulaAddress);
    const provisional = (reason: string): ArraySize => {
      ctx.pending.set(where, reason);
      recordPrediction(ctx, node, where, { rows: 1, cols: 1, provisional: reason });
      return ArraySize.scalar();
    };
    if (ctx.building && readsCells(node.args)) {
      return provisional('it reads cells that were not computed yet while the workbook was being built');
    }
    let value: unknown;
    ctx.remember++;
    ctx.sizing++;
    try {
      value = this.compute(spec, node, state);
    } catch {
      return provisional('it reads cells that were not computed yet');
    } finally {
      ctx.remember--;
      ctx.sizing--;
    }
    const size = value instanceof SimpleRangeValue ? sizeOf(value) : { rows: 1, cols: 1 };
    recordPrediction(ctx, node, where, size);
    return new ArraySize(size.cols, size.rows);
  }

  /**
   * The sizeOfResultArrayMethod of a scalar function: HyperFormula's default for a function without one
   * (the largest size among arguments it lifts the function over), except that range arguments are not
   * sized at all. By default HyperFormula sizes every argument and then ignores the ranges' sizes; sizing
   * a nested spilled call such as HC.RESPONSE inside HC.RMS would evaluate it once more when the formula
   * is read (or, while a workbook is built, mark the cell for a second reading by settleSpills).
   */
  sizeOfScalarCall(spec: FunctionSpec, node: CallNode, state: EvalState): ArraySize {
    if (!state.arraysFlag) return ArraySize.scalar();
    const { parameters, repeatLastArgs } = this.metadata(functionId(spec));
    const params = parameters ?? [];
    if (node.args.length > params.length && !repeatLastArgs) return ArraySize.error();
    let width = 1;
    let height = 1;
    for (let i = 0; i < node.args.length; i++) {
      const r = repeatLastArgs ?? 1;
      const p = i < params.length ? params[i] : params[params.length - r + ((i - params.length) % r)];
      if (p && UNSIZED.has(p.argumentType)) continue;
      const size = this.arraySizeForAst(node.args[i] as never, state as never);
      width = Math.max(width, size.width);
      height = Math.max(height, size.height);
    }
    return new ArraySize(width, height);
  }
}

/** Build a plugin class (and its identity translations) for a function table. */
export function buildPlugin(functions: readonly FunctionSpec[]): {
  plugin: FunctionPluginDefinition;
  translations: Record<string, Record<string, string>>;
} {
  const implemented: ImplementedFunctions = {};
  class HcFunctions extends HcFunctionPlugin {
    static implementedFunctions = implemented;
  }
  const proto = HcFunctions.prototype as unknown as Record<string, unknown>;
  const names: Record<string, string> = {};
  for (const spec of functions) {
    const id = functionId(spec);
    const meta: FunctionMetadata = { method: methodName(spec), ...parametersOf(spec) };
    proto[methodName(spec)] = function (this: HcFunctionPlugin, node: CallNode, state: EvalState) {
      return this.evaluateCall(spec, node, state);
    };
    meta.sizeOfResultArrayMethod = sizeMethodName(spec);
    if (spec.result === 'matrix') {
      meta.vectorizationForbidden = true;
      proto[sizeMethodName(spec)] = function (this: HcFunctionPlugin, node: CallNode, state: EvalState) {
        return this.sizeOfCall(spec, node, state);
      };
    } else {
      proto[sizeMethodName(spec)] = function (this: HcFunctionPlugin, node: CallNode, state: EvalState) {
        return this.sizeOfScalarCall(spec, node, state);
      };
    }
    implemented[id] = meta;
    names[id] = id;
  }
  return { plugin: HcFunctions as unknown as FunctionPluginDefinition, translations: { enGB: names, enUS: names } };
}
