/**
 * The command line against hostile and broken files (issue 6): a file that is not a zip, an old .xls, a
 * truncated zip, zip bombs (an honest record of 300 MB, a record that understates its size, a 1000-fold
 * ratio), ranges the reader would expand cell by cell (a merged range and a data-validation range over the
 * whole sheet), a value at XFD1048576, a <dimension> claiming the whole sheet, a saved spill claiming the
 * whole sheet, and formulas that refer to other workbooks. Each gives a clear error (or, for claims that do
 * not hold, a normal result) within seconds; the input file is never written; --out is written through a
 * temporary file and a rename. Most run `main()` in-process; the bombs run the built binary with a small heap.
 * Common practice, no source.
 */
import { spawnSync } from 'child_process';
import * as crypto from 'crypto';
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import ExcelJS from 'exceljs';
import { main } from '../src/cli/main';
import { Io } from '../src/cli/io';
import { readWorkbook, recalculate, writeRecalculated } from '../src/engine/workbook';
import { rangeArea, XLSX_LIMITS } from '../src/engine/xlsx-guard';
import { deflateRepeated, rows, sheetXml, workbookParts, zip } from './support/xlsx-craft';

const ROOT = path.join(__dirname, '..');
const BIN = path.join(ROOT, 'bin', 'hc.js');
const BUILT = path.join(ROOT, 'build', 'src', 'cli', 'main.js');

function ensureBuilt(): void {
  let newest = 0;
  const walk = (d: string): void => {
    for (const e of fs.readdirSync(d, { withFileTypes: true })) {
      const p = path.join(d, e.name);
      if (e.isDirectory()) walk(p);
      else if (p.endsWith('.ts')) newest = Math.max(newest, fs.statSync(p).mtimeMs);
    }
  };
  for (const d of ['core', 'functions', 'engine', 'cli']) walk(path.join(ROOT, 'src', d));
  if (fs.existsSync(BUILT) && fs.statSync(BUILT).mtimeMs >= newest) return;
  spawnSync(process.execPath, [require.resolve('typescript/bin/tsc'), '-p', path.join(ROOT, 'tsconfig.cli.json')], { encoding: 'utf8' });
  if (!fs.existsSync(BUILT)) throw new Error('could not build the CLI');
}

function fakeIo(): Io & { stdout: string; stderr: string } {
  const io = {
    stdout: '',
    stderr: '',
    errIsTTY: false,
    errColumns: 80,
    out(t: string) {
      io.stdout += t;
    },
    err(t: string) {
      io.stderr += t;
    },
  };
  return io;
}

let dir: string;
const file = (name: string, bytes: Buffer | string): string => {
  const p = path.join(dir, name);
  fs.writeFileSync(p, bytes);
  return p;
};
const fingerprint = (p: string) => ({ sha: crypto.createHash('sha256').update(fs.readFileSync(p)).digest('hex'), mtime: fs.statSync(p).mtimeMs });

/** Run hc in-process; checks that the input file is byte-for-byte and mtime unchanged, and that it took < `seconds`. */
async function hc(argv: string[], input: string, seconds = 10): Promise<{ code: number; out: string; err: string }> {
  const before = fingerprint(input);
  const io = fakeIo();
  const t0 = Date.now();
  const code = await main(argv, io);
  expect(Date.now() - t0).toBeLessThan(seconds * 1000);
  expect(fingerprint(input)).toEqual(before);
  return { code, out: io.stdout, err: io.stderr };
}

/** Run the built binary with a 192 MB heap; the same input checks. */
function hcSpawned(argv: string[], input: string): { code: number | null; err: string; ms: number } {
  const before = fingerprint(input);
  const t0 = Date.now();
  const r = spawnSync(process.execPath, ['--max-old-space-size=192', BIN, ...argv], { encoding: 'utf8', cwd: ROOT, timeout: 60_000 });
  expect(fingerprint(input)).toEqual(before);
  return { code: r.status, err: r.stderr, ms: Date.now() - t0 };
}

beforeAll(() => {
  ensureBuilt();
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'hc-hostile-'));
}, 120_000);
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('files that are not workbooks', () => {
  test.each([
    ['a text file', 'notes.xlsx', 'just some text\n', /not an \.xlsx workbook: an \.xlsx file is a zip archive/],
    ['an empty file', 'empty.xlsx', '', /not an \.xlsx workbook/],
    ['an old binary .xls', 'old.xls', Buffer.concat([Buffer.from('d0cf11e0a1b11ae1', 'hex'), Buffer.alloc(600)]), /old binary \(\.xls\) or a password-protected workbook/],
  ])('%s', async (_what, name, bytes, message) => {
    const p = file(name, bytes);
    for (const cmd of ['calc', 'check']) {
      const r = await hc([cmd, p], p);
      expect(r.code).toBe(2);
      expect(r.err).toMatch(message);
      expect(r.out).toBe('');
    }
  });

  test('a truncated zip', async () => {
    const whole = zip(workbookParts(sheetXml(rows([['A1', 1]]))));
    for (const keep of [0.3, 0.7, 0.97]) {
      const p = file(`cut-${keep}.xlsx`, whole.subarray(0, Math.floor(whole.length * keep)));
      const r = await hc(['calc', p], p);
      expect(r.code).toBe(2);
      expect(r.err).toMatch(/truncated or damaged|cut short|truncated/);
    }
  });

  test('the hand-made workbook itself reads (so the refusals below are about what was added)', async () => {
    const p = file('plain.xlsx', zip(workbookParts(sheetXml(rows([['A1', 2], ['B1', '=HC.VALUE("4k7")*A1']])))));
    const r = await hc(['calc', p, '--json'], p);
    expect(r.code).toBe(0);
    const cells = JSON.parse(r.out).cells as { address: string; value: unknown }[];
    expect(cells.find((c) => c.address === 'B1')?.value).toBe(9400);
  });
});

describe('zip bombs', () => {
  let honest: string;
  let lying: string;
  let ratio: string;

  beforeAll(async () => {
    const head = sheetXml(rows([['A1', 1]])).replace('</sheetData>', '');
    const spaces = Buffer.alloc(1 << 20, 0x20);
    const big = await deflateRepeated(head, spaces, 300, '</sheetData></worksheet>'); // 300 MB of XML
    expect(big.deflated.length).toBeLessThan(1 << 20); // under a megabyte on disk
    honest = file('bomb.xlsx', zip(workbookParts({ name: 'xl/worksheets/sheet1.xml', ...big })));
    lying = file('liar.xlsx', zip(workbookParts({ name: 'xl/worksheets/sheet1.xml', ...big, declaredSize: 4096 })));
    const small = await deflateRepeated(head, spaces, 20, '</sheetData></worksheet>'); // 20 MB, 1000-fold
    ratio = file('ratio.xlsx', zip(workbookParts({ name: 'xl/worksheets/sheet1.xml', ...small })));
  }, 60_000);

  test('a sheet that inflates to 300 MB is refused before it is inflated (binary, 192 MB heap)', () => {
    const r = hcSpawned(['calc', honest], honest);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/inflate to more than 64 MB .* zip bomb/);
    expect(r.ms).toBeLessThan(10_000);
  });

  test('a directory record that understates the size is caught at the stated size (binary, 192 MB heap)', () => {
    const r = hcSpawned(['check', lying], lying);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/inflates beyond the 4096 bytes its directory record declares/);
  });

  test('a part that inflates a thousandfold', async () => {
    const r = await hc(['calc', ratio], ratio);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/inflates \d+ times .* zip bomb/);
  });
});

describe('ranges the reader would expand cell by cell, and enormous sheets', () => {
  test.each([
    ['a merged range over the whole sheet', { after: '<mergeCells count="1"><mergeCell ref="A1:XFD1048576"/></mergeCells>' }, /merged ranges .* cover more than 100,000 cells/],
    [
      'a data-validation range over the whole sheet',
      { after: '<dataValidations count="1"><dataValidation type="whole" sqref="A1:XFD1048576 B2"><formula1>0</formula1></dataValidation></dataValidations>' },
      /data-validation ranges .* cover more than 100,000 cells/,
    ],
  ])('%s', async (_what, opts, message) => {
    const p = file('ranges.xlsx', zip(workbookParts(sheetXml(rows([['A1', 1]]), opts))));
    const r = await hc(['calc', p], p);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(message);
  });

  test('a value at XFD1048576', async () => {
    const p = file('far.xlsx', zip(workbookParts(sheetXml(rows([['A1', 1], ['XFD1048576', 2]])))));
    const r = await hc(['calc', p], p);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/sheet "Calc" uses A1:XFD1048576 \(17,179,869,184 cells .*\); hc reads workbooks whose sheets use at most 10,000,000/);
  });

  test('a <dimension> claiming the whole sheet is only a claim: the workbook reads normally', async () => {
    const p = file('claim.xlsx', zip(workbookParts(sheetXml(rows([['A1', 2], ['B1', '=HC.VALUE("4k7")*A1']]), { dimension: 'A1:XFD1048576' }))));
    const r = await hc(['calc', p], p, 5);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/Calc!B1\t=HC\.VALUE\("4k7"\)\*A1\t9400/);
  });

  test('a saved spill claiming the whole sheet reads and writes normally', async () => {
    const data = '<row r="1"><c r="A1"><f t="array" ref="A1:XFD1048576">_xldudf_HC.PULSE(0,1,0.5,1000,2)</f><v>0</v></c></row>';
    const p = file('spill.xlsx', zip(workbookParts(sheetXml(data))));
    const out = path.join(dir, 'spill-out.xlsx');
    const r = await hc(['calc', p, '--out', out], p, 8);
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/Calc!A1:D3/);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(out);
    expect(wb.getWorksheet('Calc')!.getCell('C2').value).toBeCloseTo(2 / Math.PI, 12); // square wave, n = 1
  });

  test('rangeArea reads every form of range (unreadable ones count as the whole sheet)', () => {
    expect(rangeArea('B2')).toBe(1);
    expect(rangeArea('$A$1:$C$4')).toBe(12);
    expect(rangeArea('C4:A1')).toBe(12);
    expect(rangeArea('A:B')).toBe(2 * 1048576);
    expect(rangeArea('3:4')).toBe(2 * 16384);
    expect(rangeArea('A1:B2:C3')).toBe(1048576 * 16384);
    expect(rangeArea('#REF!')).toBe(1048576 * 16384);
    expect(XLSX_LIMITS.mergedCells).toBeLessThan(rangeArea('A1:XFD1048576'));
  });
});

describe('formulas that refer to other workbooks', () => {
  test('each shows #REF! with a message, its dependents an error, the rest of the workbook computes', async () => {
    const p = file(
      'links.xlsx',
      zip(
        workbookParts(
          sheetXml(
            rows([
              ['A1', 1],
              ['B1', '=[1]Sheet1!A1'],
              ['B2', "='[Book2.xlsx]Sheet 1'!A1+1"],
              ['B3', '=SUM([Book2.xlsx]Sheet1!A1:A3)'],
              ['B4', '=B1*2'],
              ['B5', '=A1+1'],
              ['B6', '="[1]Sheet1!A1"'], // a text, not a reference
              ['B7', '=[1]!Rate'],
            ]),
          ),
        ),
      ),
    );
    const r = await hc(['calc', p, '--json'], p);
    expect(r.code).toBe(0);
    const cells = JSON.parse(r.out).cells as { address: string; value: { error?: string; message?: string } | number | string }[];
    const at = (a: string) => cells.find((c) => c.address === a)!.value;
    for (const a of ['B1', 'B2', 'B3', 'B7']) {
      expect(at(a)).toEqual({ error: '#REF!', message: expect.stringMatching(/refers to another workbook \(.+\); hc reads one workbook and does not follow external links/) });
    }
    expect((at('B2') as { message: string }).message).toContain("'[Book2.xlsx]Sheet 1'!A1");
    expect(at('B4')).toMatchObject({ error: '#REF!' });
    expect(at('B5')).toBe(2);
    expect(at('B6')).toBe('[1]Sheet1!A1');
    expect(r.err).toMatch(/warning: Calc!B1 refers to another workbook/);
  });
});

describe('--out', () => {
  let input: string;
  beforeAll(() => {
    input = file('in.xlsx', zip(workbookParts(sheetXml(rows([['A1', 3], ['B1', '=A1*2']])))));
  });

  test('replaces an existing file whole, leaving no temporary file', async () => {
    const out = file('existing-out.xlsx', 'old content that must go');
    const r = await hc(['calc', input, '--out', out], input);
    expect(r.code).toBe(0);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(out);
    expect((wb.getWorksheet('Calc')!.getCell('B1').value as { result: number }).result).toBe(6);
    expect(fs.readdirSync(dir).filter((n) => n.startsWith('.hc-tmp-'))).toEqual([]);
  });

  test('into a folder that does not exist: a usage error, nothing written', async () => {
    const out = path.join(dir, 'no-such-folder', 'out.xlsx');
    const r = await hc(['calc', input, '--out', out], input);
    expect(r.code).toBe(2);
    expect(r.err).toMatch(/ENOENT|no such file/i);
    expect(fs.existsSync(path.dirname(out))).toBe(false);
  });

  test('a write that fails half way leaves the previous file and no temporary file (write, then rename)', async () => {
    const out = file('keep.xlsx', 'previous version');
    const book = await readWorkbook(input);
    const { results } = recalculate(book);
    // The workbook writer writes part of the temporary file, then fails.
    book.workbook.xlsx.writeFile = async (tmp: string) => {
      fs.writeFileSync(tmp, 'partial');
      throw new Error('disk full');
    };
    await expect(writeRecalculated(book, results, out)).rejects.toThrow('disk full');
    expect(fs.readFileSync(out, 'utf8')).toBe('previous version');
    expect(fs.readdirSync(dir).filter((n) => n.startsWith('.hc-tmp-'))).toEqual([]);
  });

  test('the temporary file is in the folder of --out (so the rename cannot cross file systems)', async () => {
    const sub = path.join(dir, 'sub');
    fs.mkdirSync(sub);
    const book = await readWorkbook(input);
    const { results } = recalculate(book);
    let tmpSeen = '';
    const write = book.workbook.xlsx.writeFile.bind(book.workbook.xlsx);
    book.workbook.xlsx.writeFile = async (tmp: string) => {
      tmpSeen = tmp;
      expect(fs.existsSync(path.join(sub, 'final.xlsx'))).toBe(false); // not visible under its name until renamed
      return write(tmp);
    };
    await writeRecalculated(book, results, path.join(sub, 'final.xlsx'));
    expect(path.dirname(tmpSeen)).toBe(sub);
    expect(fs.readdirSync(sub)).toEqual(['final.xlsx']);
  });
});
