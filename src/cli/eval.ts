import { NotAFormulaError } from 'hyperformula';
import { createEngine } from '../engine/engine';
import { engineFormula } from '../engine/formula-text';
import { isErrorValue, plainValue, PlainValue } from '../engine/results';
import { parseArgs } from './args';
import { formatError, formatRows, formatValue } from './format';
import { EVAL_HELP } from './help';
import { EXIT, Io, UsageError } from './io';

/** hc eval '=FORMULA' */
export function runEval(argv: string[], io: Io): number {
  const args = parseArgs(argv, { flags: ['json'] });
  if (args.flags.has('help')) {
    io.out(EVAL_HELP);
    return EXIT.ok;
  }
  if (args.positionals.length !== 1) throw new UsageError('give exactly one formula, quoted, e.g. hc eval \'=HC.VALUE("4k7")\'.');
  const text = args.positionals[0].trim();
  if (text === '' || text === '=') throw new UsageError('the formula is empty.');
  const hf = createEngine();
  let raw;
  try {
    raw = hf.calculateFormula(engineFormula(text), 0);
  } catch (e) {
    if (e instanceof NotAFormulaError) throw new UsageError(`cannot parse the formula ${text} (check brackets, quotes and separators: "," between arguments).`);
    throw e;
  }
  const value: PlainValue | PlainValue[][] = Array.isArray(raw) ? raw.map((r) => r.map(plainValue)) : plainValue(raw);
  const error = errorOf(value);
  if (args.flags.has('json')) {
    io.out(`${JSON.stringify(error ?? { value })}\n`);
    return error ? EXIT.errorResult : EXIT.ok;
  }
  if (error) {
    io.err(`${formatError(error)}\n`);
    return EXIT.errorResult;
  }
  io.out(`${Array.isArray(value) ? formatRows(value) : formatValue(value)}\n`);
  return EXIT.ok;
}

/** The error of a result: a scalar error, or an array whose cells are all the same error (a failed spill). */
function errorOf(v: PlainValue | PlainValue[][]): { error: string; message: string } | undefined {
  if (!Array.isArray(v)) return isErrorValue(v) ? v : undefined;
  const first = v[0]?.[0];
  if (!isErrorValue(first)) return undefined;
  const same = v.every((row) => row.every((c) => isErrorValue(c) && c.error === first.error && c.message === first.message));
  return same ? first : undefined;
}
