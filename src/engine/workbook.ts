import * as fs from 'fs';
import * as path from 'path';
import ExcelJS from 'exceljs';
import { HyperFormula, RawCellContent, SerializedNamedExpression, Sheets } from 'hyperformula';
import { a1, parseRange } from './cells';
import { createEngine, EngineOptions } from './engine';
import { mapOutsideStrings, normaliseFormula } from './formula-text';
import { readXlsxGuarded, XLSX_LIMITS, XlsxRefused } from './xlsx-guard';
import { formulaResult, FormulaResult, isErrorValue, PlainValue } from './results';

/**
 * Reading an .xlsx workbook into the engine and writing a recalculated copy (exceljs).
 * Formulas are normalised on the way in (saved-file prefixes); the copy keeps the file's own formula text
 * and only replaces cached results, so it opens in Excel as the same workbook.
 */

export interface FormulaCell {
  sheet: string;
  sheetIndex: number;
  row: number;
  col: number;
  /** Formula text as stored in the file (no leading "="). */
  stored: string;
  /** Formula as given to the engine. */
  formula: string;
  /** For an array (spilled) formula in the file: the range it covered when saved. */
  arrayRef?: string;
  /** Set when the formula is not evaluated (it refers to another workbook): the cell shows #REF! with this. */
  refused?: string;
}

export interface LoadedWorkbook {
  file: string;
  workbook: ExcelJS.Workbook;
  sheetNames: string[];
  sheets: Sheets;
  namedExpressions: SerializedNamedExpression[];
  formulas: FormulaCell[];
  warnings: string[];
}

/** Excel's 1900 date system: serial day numbers counted from 1899-12-30 (the leap-year bug included). */
const EXCEL_EPOCH_MS = Date.UTC(1899, 11, 30);
const toSerial = (d: Date): number => (d.getTime() - EXCEL_EPOCH_MS) / 86_400_000;

function plainCell(value: ExcelJS.CellValue): RawCellContent {
  if (value === null || value === undefined) return null;
  if (typeof value === 'number' || typeof value === 'string' || typeof value === 'boolean') return value;
  if (value instanceof Date) return toSerial(value);
  if (typeof value === 'object') {
    if ('richText' in value) return value.richText.map((t) => t.text).join('');
    if ('error' in value) return value.error;
    if ('text' in value && typeof value.text === 'string') return value.text;
  }
  return null;
}

/**
 * A reference to another workbook, as saved (`[1]Sheet1!A1`, `[1]!Name`) or as typed
 * (`'[Book2.xlsx]Sheet 1'!A1`, `[Book2.xlsx]Sheet1!A1`); structured references (`Table1[Col]`) have no `!`.
 */
const EXTERNAL_REFERENCE = /'\[[^\]]+\][^']*'!|\[[^[\]"]+\][A-Za-z0-9_.]*!/;

/** The first reference to another workbook in a formula (outside its string literals), if any. */
export function externalReference(formula: string): string | undefined {
  let found: string | undefined;
  mapOutsideStrings(formula, (code) => {
    const m = found === undefined ? EXTERNAL_REFERENCE.exec(code) : null;
    if (m) {
      const tail = /^[A-Za-z0-9_$:.]*/.exec(code.slice(m.index + m[0].length));
      found = m[0] + (tail ? tail[0] : '');
    }
    return code;
  });
  return found;
}

export async function readWorkbook(file: string): Promise<LoadedWorkbook> {
  const workbook = new ExcelJS.Workbook();
  // Sizes, zip bombs and ranges the reader would expand cell by cell are checked first (xlsx-guard.ts).
  await workbook.xlsx.load(readXlsxGuarded(file) as unknown as Parameters<typeof workbook.xlsx.load>[0]);
  const sheets: Sheets = {};
  const sheetNames: string[] = [];
  const formulas: FormulaCell[] = [];
  const warnings: string[] = [];
  let usedArea = 0;
  workbook.worksheets.forEach((ws, sheetIndex) => {
    sheetNames.push(ws.name);
    const grid: RawCellContent[][] = [];
    const spills: { row: number; col: number; ref: string }[] = [];
    usedArea += checkUsedArea(ws, usedArea);
    ws.eachRow({ includeEmpty: false }, (row, rowNumber) => {
      row.eachCell({ includeEmpty: false }, (cell, colNumber) => {
        if (cell.isMerged && cell.master !== cell) return;
        const r = rowNumber - 1;
        const c = colNumber - 1;
        (grid[r] ??= [])[c] = null;
        if (cell.type === ExcelJS.ValueType.Formula) {
          const stored = cell.formula;
          if (!stored) return;
          const v = cell.value as { shareType?: string; ref?: string };
          const arrayRef = v.shareType === 'array' && v.ref ? v.ref : undefined;
          const formula = normaliseFormula(stored);
          const external = externalReference(formula);
          const refused = external
            ? `${ws.name}!${a1(r, c)} refers to another workbook (${external}); hc reads one workbook and does not follow external links.`
            : undefined;
          formulas.push({ sheet: ws.name, sheetIndex, row: r, col: c, stored, formula, arrayRef, refused });
          if (refused) warnings.push(`${refused} The cell shows #REF!.`);
          grid[r][c] = refused ? '=#REF!' : formula; // dependents see the error too
          if (arrayRef) spills.push({ row: r, col: c, ref: arrayRef });
        } else {
          grid[r][c] = plainCell(cell.value);
        }
      });
    });
    // Cells inside a saved spill hold cached results; the engine spills the formula there itself.
    for (const s of spills) {
      const area = parseRange(s.ref);
      if (!area) continue;
      // Only cells that hold something: a saved ref may claim the whole sheet.
      for (let r = area.top; r <= Math.min(area.bottom, grid.length - 1); r++) {
        const row = grid[r];
        if (!row) continue;
        for (let c = area.left; c <= Math.min(area.right, row.length - 1); c++) {
          if (r !== s.row || c !== s.col) row[c] = null;
        }
      }
    }
    for (let r = 0; r < grid.length; r++) grid[r] ??= [];
    sheets[ws.name] = grid;
  });
  const namedExpressions: SerializedNamedExpression[] = [];
  for (const dn of workbook.definedNames.model) {
    if (dn.name.startsWith('_xlnm.')) continue;
    if (dn.ranges.length !== 1) {
      warnings.push(`name ${dn.name} refers to ${dn.ranges.length} areas; only single areas are supported, skipped.`);
      continue;
    }
    namedExpressions.push({ name: dn.name, expression: `=${dn.ranges[0]}` });
  }
  return { file, workbook, sheetNames, sheets, namedExpressions, formulas, warnings };
}

/**
 * The used ranges of the sheets (A1 to each sheet's last row and column with a value) must stay within
 * XLSX_LIMITS.sheetArea together: the engine lays a sheet out to that rectangle, and one stray value at
 * XFD1048576 would make it 17 billion cells. A sheet's `<dimension>` claim is not used. Returns the area.
 */
function checkUsedArea(ws: ExcelJS.Worksheet, before: number): number {
  let rows = 0;
  let cols = 0;
  ws.eachRow({ includeEmpty: false }, (row, rowNumber) => {
    row.eachCell({ includeEmpty: false }, (_cell, colNumber) => {
      if (colNumber > cols) cols = colNumber;
      if (rowNumber > rows) rows = rowNumber;
    });
  });
  if (before + rows * cols > XLSX_LIMITS.sheetArea) {
    throw new XlsxRefused(
      `sheet ${JSON.stringify(ws.name)} uses A1:${a1(rows - 1, cols - 1)} (${(rows * cols).toLocaleString('en-US')} cells from A1 to its last ` +
        `row and column with a value); hc reads workbooks whose sheets use at most ${XLSX_LIMITS.sheetArea.toLocaleString('en-US')} ` +
        'cells in all. Delete stray values far from the data.',
    );
  }
  return rows * cols;
}

export interface Recalculated {
  hf: HyperFormula;
  results: FormulaResult[];
}

/** Build an engine from a loaded workbook and collect every formula cell's value (in file order). */
export function recalculate(book: LoadedWorkbook, options: EngineOptions = {}): Recalculated {
  let hf: HyperFormula;
  try {
    hf = createEngine(book.sheets, { ...options, namedExpressions: book.namedExpressions });
  } catch (e) {
    // A name HyperFormula rejects should not stop the whole workbook: retry without names, say which.
    if (book.namedExpressions.length === 0) throw e;
    book.warnings.push(`workbook names were not loaded: ${(e as Error).message}`);
    hf = createEngine(book.sheets, options);
  }
  const results = book.formulas.map((f) => {
    const sheet = hf.getSheetId(f.sheet) ?? f.sheetIndex;
    if (f.refused) return { sheet: f.sheet, address: a1(f.row, f.col), row: f.row, col: f.col, formula: f.formula, value: { error: '#REF!', message: f.refused } };
    return formulaResult(hf, f.sheet, { sheet, row: f.row, col: f.col }, f.formula);
  });
  return { hf, results };
}

const EXCEL_ERRORS = new Set(['#NULL!', '#DIV/0!', '#VALUE!', '#REF!', '#NAME?', '#NUM!', '#N/A', '#SPILL!', '#CALC!']);

/** A plain value as exceljs stores it; engine-only errors (#CYCLE!, #ERROR!, #LIC!) are saved as #VALUE!. */
function storedValue(v: PlainValue): ExcelJS.CellValue {
  if (isErrorValue(v)) return { error: (EXCEL_ERRORS.has(v.error) ? v.error : '#VALUE!') as ExcelJS.CellErrorValue['error'] };
  return v;
}

/**
 * Write a copy of the workbook with recalculated results to `out`, atomically: a temporary file in the
 * same directory, then a rename. Refuses to write over the file the workbook was read from.
 */
export async function writeRecalculated(book: LoadedWorkbook, results: FormulaResult[], out: string): Promise<void> {
  if (sameFile(book.file, out)) throw new Error(`refusing to write over the input workbook ${book.file}; choose another --out path.`);
  const byCell = new Map(results.map((r) => [`${r.sheet}!${r.row}:${r.col}`, r]));
  for (const f of book.formulas) {
    const ws = book.workbook.getWorksheet(f.sheet);
    const r = byCell.get(`${f.sheet}!${f.row}:${f.col}`);
    if (!ws || !r) continue;
    // Clear the cached values of the spill as saved; the new spill is written below.
    const old = f.arrayRef ? parseRange(f.arrayRef) : undefined;
    if (old) {
      // Within the cells the sheet has (a saved ref may claim the whole sheet).
      const grid = book.sheets[f.sheet] ?? [];
      for (let row = old.top; row <= Math.min(old.bottom, grid.length - 1); row++) {
        const cells = grid[row]?.length ?? 0;
        for (let col = old.left; col <= Math.min(old.right, cells - 1); col++) {
          if (row !== f.row || col !== f.col) ws.getCell(row + 1, col + 1).value = null;
        }
      }
    }
    const cell = ws.getCell(f.row + 1, f.col + 1);
    if (r.spill) {
      cell.value = { formula: f.stored, shareType: 'array', ref: r.spill.ref, result: storedValue(r.value) } as unknown as ExcelJS.CellValue;
      r.spill.values.forEach((rowValues, dr) =>
        rowValues.forEach((v, dc) => {
          if (dr !== 0 || dc !== 0) ws.getCell(f.row + dr + 1, f.col + dc + 1).value = storedValue(v);
        }),
      );
    } else {
      cell.value = { formula: f.stored, result: storedValue(r.value) } as ExcelJS.CellValue;
    }
  }
  // Excel recomputes on open; the cached results serve readers that do not calculate.
  book.workbook.calcProperties = { ...book.workbook.calcProperties, fullCalcOnLoad: true };
  const dir = path.dirname(path.resolve(out));
  const tmp = path.join(dir, `.hc-tmp-${process.pid}-${Date.now().toString(36)}.xlsx`);
  try {
    await book.workbook.xlsx.writeFile(tmp);
    fs.renameSync(tmp, out);
  } catch (e) {
    fs.rmSync(tmp, { force: true });
    throw e;
  }
}

/** Whether two paths name the same file (after resolving symlinks, or by device and inode). */
export function sameFile(a: string, b: string): boolean {
  const ra = path.resolve(a);
  const rb = path.resolve(b);
  if (ra === rb) return true;
  try {
    if (fs.realpathSync(ra) === fs.realpathSync(rb)) return true;
    const sa = fs.statSync(ra);
    const sb = fs.statSync(rb);
    return sa.dev === sb.dev && sa.ino === sb.ino;
  } catch {
    return false;
  }
}

export const cellName = (f: { sheet: string; row: number; col: number }): string => `${f.sheet}!${a1(f.row, f.col)}`;
