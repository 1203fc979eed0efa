import { HyperFormula } from 'hyperformula';
import { a1 } from '../engine/cells';
import { plainValue, PlainValue } from '../engine/results';
import { parseArgs } from './args';
import { formatValue } from './format';
import { CHECK_HELP } from './help';
import { EXIT, Io, UsageError } from './io';
import { loadAndRecalculate } from './workbook-run';

/** The sheet that holds a workbook's checks (matched without regard to case). */
export const CHECKS_SHEET = 'Checks';

export interface CheckResult {
  label: string;
  cell: string;
  value: PlainValue;
  pass: boolean;
  note: string;
}

/** The checks of a recalculated workbook (the Checks sheet convention), or undefined if it has no Checks sheet. */
export function readChecks(hf: HyperFormula, sheetNames: string[]): { sheetName: string; checks: CheckResult[] } | undefined {
  const sheetName = sheetNames.find((n) => n.toLowerCase() === CHECKS_SHEET.toLowerCase());
  if (sheetName === undefined) return undefined;
  const sheet = hf.getSheetId(sheetName) as number;
  const { height } = hf.getSheetDimensions(sheet);
  const checks: CheckResult[] = [];
  for (let row = 1; row < height; row++) {
    const at = (col: number): PlainValue => plainValue(hf.getCellValue({ sheet, row, col }));
    const label = at(0);
    const formula = hf.getCellFormula({ sheet, row, col: 1 });
    const value = at(1);
    if ((label === null || label === '') && formula === undefined && (value === null || value === '')) continue;
    const note = at(2);
    checks.push({
      label: label === null || label === '' ? `(row ${row + 1})` : formatValue(label),
      cell: `${sheetName}!${a1(row, 1)}`,
      value,
      pass: value === true,
      note: note === null ? '' : formatValue(note),
    });
  }
  return { sheetName, checks };
}

/** hc check BOOK.xlsx [--json] */
export async function runCheck(argv: string[], io: Io): Promise<number> {
  const args = parseArgs(argv, { flags: ['json'] });
  if (args.flags.has('help')) {
    io.out(CHECK_HELP);
    return EXIT.ok;
  }
  if (args.positionals.length !== 1) throw new UsageError('give one workbook, e.g. hc check design.xlsx');
  const file = args.positionals[0];
  const { book, hf } = await loadAndRecalculate(file, io);
  const found = readChecks(hf, book.sheetNames);
  if (!found) throw new UsageError(`${file} has no sheet named ${CHECKS_SHEET} (columns Label | Check | Note; see hc check --help).`);
  const { sheetName, checks } = found;
  if (checks.length === 0) throw new UsageError(`the ${sheetName} sheet of ${file} holds no checks below its header row.`);
  const failed = checks.filter((c) => !c.pass);
  if (args.flags.has('json')) {
    io.out(`${JSON.stringify({ file, passed: checks.length - failed.length, failed: failed.length, checks }, null, 1)}\n`);
  } else {
    for (const c of checks) {
      const shown = c.pass ? '' : `\t${describe(c.value)}`;
      io.out(`${c.pass ? 'PASS' : 'FAIL'}\t${c.label}${shown}${c.note && !c.pass ? `\t(${c.note})` : ''}\n`);
    }
    io.out(`${checks.length - failed.length} of ${checks.length} checks pass${failed.length ? `; failing: ${failed.map((c) => c.label).join('; ')}` : ''}\n`);
  }
  return failed.length ? EXIT.checksFailed : EXIT.ok;
}

export function describe(v: PlainValue): string {
  if (typeof v === 'object' && v !== null) return `${v.error}${v.message ? ` ${v.message}` : ''}`;
  if (v === null) return '(empty)';
  return formatValue(v);
}
