import { FormulaResult, isErrorValue } from '../engine/results';
import { sameFile, writeRecalculated } from '../engine/workbook';
import { parseArgs } from './args';
import { formatError, formatRows, formatValue } from './format';
import { CALC_HELP } from './help';
import { EXIT, Io, UsageError } from './io';
import { loadAndRecalculate } from './workbook-run';

/** Rows of a spill printed in text mode; --json carries them all. */
const TEXT_ROWS = 20;

/** hc calc BOOK.xlsx [--sheet NAME] [--json] [--out FILE] */
export async function runCalc(argv: string[], io: Io): Promise<number> {
  const args = parseArgs(argv, { values: ['sheet', 'out'], flags: ['json'] });
  if (args.flags.has('help')) {
    io.out(CALC_HELP);
    return EXIT.ok;
  }
  if (args.positionals.length !== 1) throw new UsageError('give one workbook, e.g. hc calc design.xlsx');
  const file = args.positionals[0];
  const out = args.values.out;
  if (out !== undefined && sameFile(file, out)) {
    throw new UsageError(`--out ${out} is the input workbook; hc never writes over its input. Choose another file.`);
  }
  const { book, results } = await loadAndRecalculate(file, io);
  const sheet = args.values.sheet;
  if (sheet !== undefined && !book.sheetNames.includes(sheet)) {
    throw new UsageError(`no sheet named ${JSON.stringify(sheet)}; the sheets are ${book.sheetNames.map((s) => JSON.stringify(s)).join(', ')}.`);
  }
  const shown = sheet === undefined ? results : results.filter((r) => r.sheet === sheet);
  if (args.flags.has('json')) {
    io.out(`${JSON.stringify({ file, sheets: book.sheetNames, cells: shown, warnings: book.warnings }, null, 1)}\n`);
  } else {
    for (const r of shown) io.out(textOf(r));
  }
  if (out !== undefined) {
    await writeRecalculated(book, results, out);
    io.err(`wrote ${out}\n`);
  }
  return EXIT.ok;
}

function textOf(r: FormulaResult): string {
  const where = `${r.sheet}!${r.spill ? r.spill.ref : r.address}`;
  if (!r.spill) {
    const value = isErrorValue(r.value) ? formatError(r.value) : formatValue(r.value);
    return `${where}\t${r.formula}\t${value}\n`;
  }
  const rows = r.spill.values.slice(0, TEXT_ROWS);
  const more = r.spill.rows - rows.length;
  const body = formatRows(rows)
    .split('\n')
    .map((line) => `  ${line}`)
    .join('\n');
  return `${where}\t${r.formula}\t[${r.spill.rows} × ${r.spill.cols}]\n${body}\n${more > 0 ? `  … ${more} more rows (--json prints all)\n` : ''}`;
}
