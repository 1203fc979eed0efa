/**
 * End-to-end tests of the `hc` binary (bin/hc.js → build/src/cli), spawned as a user runs it. Expected values
 * come from the core functions called directly (common practice, no source).
 */
import { spawnSync } from 'child_process';
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import ExcelJS from 'exceljs';
import { pulse } from '../src/core/waveforms';
import { spectrumFromTable, spectrumToTable } from '../src/core/spectrum';
import { rms } from '../src/core/measures';

const ROOT = path.join(__dirname, '..');
const BIN = path.join(ROOT, 'bin', 'hc.js');
const BUILT = path.join(ROOT, 'build', 'src', 'cli', 'main.js');

/** Newest modification time of the sources the CLI is built from. */
function newestSource(): number {
  let newest = 0;
  const walk = (dir: string): void => {
    for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
      const p = path.join(dir, e.name);
      if (e.isDirectory()) walk(p);
      else if (p.endsWith('.ts')) newest = Math.max(newest, fs.statSync(p).mtimeMs);
    }
  };
  for (const d of ['core', 'functions', 'engine', 'cli']) walk(path.join(ROOT, 'src', d));
  return newest;
}

/** The tests run the built binary; rebuild it when a source is newer (CI builds it in `npm ci` via prepare). */
function ensureBuilt(): void {
  if (fs.existsSync(BUILT) && fs.statSync(BUILT).mtimeMs >= newestSource()) return;
  const r = spawnSync(process.execPath, [require.resolve('typescript/bin/tsc'), '-p', path.join(ROOT, 'tsconfig.cli.json')], { encoding: 'utf8' });
  if (!fs.existsSync(BUILT)) throw new Error(`could not build the CLI:\n${r.stdout}${r.stderr}`);
}

function hc(...args: string[]): { code: number | null; out: string; err: string } {
  const r = spawnSync(process.execPath, [BIN, ...args], { encoding: 'utf8', cwd: ROOT });
  return { code: r.status, out: r.stdout, err: r.stderr };
}

let dir: string;
let book: string;
let failing: string;
let noChecks: string;

type Formula = { formula: string; result?: unknown; shareType?: string; ref?: string };

async function writeBook(file: string, extraCheck: boolean, withChecks = true): Promise<void> {
  const wb = new ExcelJS.Workbook();
  const calc = wb.addWorksheet('Calc');
  const f = (formula: string, more: Partial<Formula> = {}): ExcelJS.CellValue => ({ formula, ...more }) as ExcelJS.CellValue;
  // Spill from a literal harmonic count, saved as a plain (not array) formula by an add-in prefix.
  calc.getCell('A1').value = f('_xldudf_HC.PULSE(0,12,0.25,400000,3)');
  // Spill from a cell, saved as an array formula over a stale 2-row range with stale cached values.
  calc.getCell('F1').value = f('_xldudf_HC.PULSE(0,1,0.5,1000,K1)', { shareType: 'array', ref: 'F1:I2', result: 99 });
  calc.getCell('G2').value = 99;
  calc.getCell('K1').value = 4;
  calc.getCell('A10').value = f('_xldudf_HC.RMS(A1:D4)');
  calc.getCell('A11').value = f('_xlfn.STDEV.S(1,2,3)');
  calc.getCell('A12').value = f('_xldudf_HC.VALUE("4k7")');
  calc.getCell('A13').value = f('_xldudf_HC.PULSE(0,1,0.5,10,-1)');
  if (withChecks) {
    const checks = wb.addWorksheet('Checks');
    checks.addRow(['Label', 'Check', 'Note']);
    checks.addRow(['RMS is positive', f('Calc!A10>0')]);
    checks.addRow(['4k7 reads as 4700', f('Calc!A12=4700'), 'IEC 60062 letter code']);
    if (extraCheck) checks.addRow(['deliberately failing', f('Calc!A12>5000'), 'a check that must fail']);
  }
  await wb.xlsx.writeFile(file);
}

beforeAll(async () => {
  ensureBuilt();
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'hc-cli-'));
  book = path.join(dir, 'book.xlsx');
  failing = path.join(dir, 'failing.xlsx');
  noChecks = path.join(dir, 'plain.xlsx');
  await writeBook(book, false);
  await writeBook(failing, true);
  await writeBook(noChecks, false, false);
}, 120_000);

afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('hc eval', () => {
  it('prints a number at full precision', () => {
    const r = hc('eval', '=HC.RMS(HC.PULSE(0, 12, 0.3, 250000, 99))');
    expect(r.code).toBe(0);
    // The engine hands the nested call's spectrum over as it is (src/functions/spectral.ts), without the table
    // round trip Excel makes between cells: the result is the core's to the bit.
    const expected = rms(pulse(0, 12, 0.3, 250e3, 99, 0, 0, 0));
    expect(r.out).toBe(`${String(expected)}\n`);
    expect(Number(r.out)).toBe(expected);
  });

  it('prints an array (spilled from a literal) as tab-separated rows', () => {
    const r = hc('eval', '=HC.PULSE(0, 12, 0.25, 400000, 3)');
    expect(r.code).toBe(0);
    const expected = spectrumToTable(pulse(0, 12, 0.25, 400e3, 3, 0, 0, 0));
    expect(r.out).toBe(`${expected.map((row) => row.map(String).join('\t')).join('\n')}\n`);
  });

  it('prints an error result on stderr with its message and exits 3', () => {
    const r = hc('eval', '=HC.PULSE(0, 12, 0.25, 400000, -1)');
    expect(r.code).toBe(3);
    expect(r.out).toBe('');
    expect(r.err).toMatch(/^#NUM! harmonics must be a whole number/);
  });
});

describe('hc calc', () => {
  it('recalculates every formula (prefixes, spills from a literal and from a cell) and prints JSON', () => {
    const r = hc('calc', book, '--json');
    expect(r.code).toBe(0);
    const doc = JSON.parse(r.out) as { sheets: string[]; cells: { sheet: string; address: string; value: unknown; spill?: { ref: string; values: unknown[][] } }[] };
    expect(doc.sheets).toEqual(['Calc', 'Checks']);
    const cell = (s: string, a: string) => doc.cells.find((c) => c.sheet === s && c.address === a)!;
    const src = spectrumToTable(pulse(0, 12, 0.25, 400e3, 3, 0, 0, 0));
    expect(cell('Calc', 'A1').spill).toEqual({ ref: 'A1:D4', rows: 4, cols: 4, values: src });
    expect(cell('Calc', 'F1').spill?.ref).toBe('F1:I5');
    expect(cell('Calc', 'F1').spill?.values).toEqual(spectrumToTable(pulse(0, 1, 0.5, 1000, 4, 0, 0, 0)));
    expect(cell('Calc', 'A10').value).toBe(rms(spectrumFromTable(src)));
    expect(cell('Calc', 'A11').value).toBe(1);
    expect(cell('Calc', 'A12').value).toBe(4700);
    expect(cell('Calc', 'A13').value).toEqual({ error: '#NUM!', message: expect.stringMatching(/harmonics/) });
    expect(cell('Checks', 'B2').value).toBe(true);
  });

  it('prints formula cells as text, one sheet with --sheet', () => {
    const r = hc('calc', book, '--sheet', 'Checks');
    expect(r.code).toBe(0);
    expect(r.out).toBe('Checks!B2\t=Calc!A10>0\tTRUE\nChecks!B3\t=Calc!A12=4700\tTRUE\n');
  });

  it('writes a recalculated copy with --out and never touches the input', async () => {
    const before = fs.readFileSync(book);
    const mtime = fs.statSync(book).mtimeMs;
    const out = path.join(dir, 'recalculated.xlsx');
    const r = hc('calc', book, '--out', out);
    expect(r.code).toBe(0);
    expect(fs.readFileSync(book).equals(before)).toBe(true);
    expect(fs.statSync(book).mtimeMs).toBe(mtime);
    expect(fs.readdirSync(dir).filter((n) => n.startsWith('.hc-tmp-'))).toEqual([]);

    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(out);
    const ws = wb.getWorksheet('Calc')!;
    const a1 = ws.getCell('A1').value as Formula;
    expect(a1).toMatchObject({ formula: '_xldudf_HC.PULSE(0,12,0.25,400000,3)', shareType: 'array', ref: 'A1:D4' });
    expect(ws.getCell('C2').value).toBe(spectrumToTable(pulse(0, 12, 0.25, 400e3, 3, 0, 0, 0))[1][2]);
    expect((ws.getCell('F1').value as Formula).ref).toBe('F1:I5');
    expect(ws.getCell('G2').value).toBe(1000); // the stale cached 99 is replaced
    expect(ws.getCell('G5').value).toBe(4000);
    expect((ws.getCell('A10').value as Formula).formula).toBe('_xldudf_HC.RMS(A1:D4)');
    expect((ws.getCell('A10').value as Formula).result).toBe(rms(spectrumFromTable(spectrumToTable(pulse(0, 12, 0.25, 400e3, 3, 0, 0, 0)))));
    expect((ws.getCell('A13').value as Formula).result).toEqual({ error: '#NUM!' });
  });

  it('refuses --out naming the input file, by any path', () => {
    const before = fs.readFileSync(book);
    const mtime = fs.statSync(book).mtimeMs;
    const r = hc('calc', book, '--out', path.join(dir, '.', 'sub', '..', 'book.xlsx'));
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/never writes over its input/);
    expect(fs.readFileSync(book).equals(before)).toBe(true);
    expect(fs.statSync(book).mtimeMs).toBe(mtime);
  });
});

describe('hc check', () => {
  it('exits 0 when every check is TRUE', () => {
    const r = hc('check', book);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/^PASS\tRMS is positive\nPASS\t4k7 reads as 4700\n2 of 2 checks pass\n$/);
  });

  it('exits 1 and lists each failing check with its label and value', () => {
    const r = hc('check', failing);
    expect(r.code).toBe(1);
    expect(r.out).toContain('FAIL\tdeliberately failing\tFALSE\t(a check that must fail)\n');
    expect(r.out).toContain('failing: deliberately failing');
  });

  it('exits 2 for a workbook without a Checks sheet', () => {
    const r = hc('check', noChecks);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/no sheet named Checks/);
  });
});
