import { CellValue, DetailedCellError, HyperFormula, SimpleCellAddress } from 'hyperformula';
import { a1 } from './cells';

/** An engine value in plain form: errors become { error: '#VALUE!', message }. */
export type ErrorValue = { error: string; message: string };
export type PlainValue = number | string | boolean | null | ErrorValue;

export function isErrorValue(v: unknown): v is ErrorValue {
  return typeof v === 'object' && v !== null && typeof (v as ErrorValue).error === 'string';
}

export function plainValue(v: CellValue | undefined): PlainValue {
  if (v instanceof DetailedCellError) return { error: v.value, message: v.message ?? '' };
  if (v === undefined) return null;
  return v as number | string | boolean | null;
}

/** Rows × columns a formula cell spills to (1 × 1 for a scalar formula or a #SPILL!). */
export function spillSize(hf: HyperFormula, address: SimpleCellAddress): { rows: number; cols: number } {
  // HyperFormula exposes no public call for an array's extent; its dependency graph (marked internal)
  // holds it on the formula's vertex. Fall back to walking the ARRAY cells if that ever changes.
  try {
    const vertex = (hf.dependencyGraph as unknown as { getCell(a: SimpleCellAddress): unknown }).getCell(address) as
      | { width?: unknown; height?: unknown; isLeftCorner?: unknown }
      | undefined;
    if (vertex && typeof vertex.width === 'number' && typeof vertex.height === 'number' && typeof vertex.isLeftCorner === 'function') {
      return { rows: vertex.height, cols: vertex.width };
    }
    if (vertex) return { rows: 1, cols: 1 };
  } catch {
    /* fall through */
  }
  if (hf.getCellType(address) !== 'ARRAYFORMULA') return { rows: 1, cols: 1 };
  const inArray = (row: number, col: number): boolean =>
    hf.getCellType({ sheet: address.sheet, row, col }) === 'ARRAY';
  let cols = 1;
  while (inArray(address.row, address.col + cols)) cols++;
  let rows = 1;
  while (inArray(address.row + rows, address.col)) rows++;
  return { rows, cols };
}

export interface FormulaResult {
  sheet: string;
  address: string;
  row: number;
  col: number;
  /** The formula as the engine evaluated it. */
  formula: string;
  /** The value, or the top-left value of a spill. */
  value: PlainValue;
  /** Present when the formula spills over more than one cell. */
  spill?: { ref: string; rows: number; cols: number; values: PlainValue[][] };
}

/** Value (and spill) of one formula cell. */
export function formulaResult(hf: HyperFormula, sheetName: string, address: SimpleCellAddress, formula: string): FormulaResult {
  const { rows, cols } = spillSize(hf, address);
  const value = plainValue(hf.getCellValue(address));
  const base = { sheet: sheetName, address: a1(address.row, address.col), row: address.row, col: address.col, formula, value };
  if (rows * cols <= 1 || isErrorValue(value)) return base;
  const values = hf
    .getRangeValues({ start: address, end: { sheet: address.sheet, row: address.row + rows - 1, col: address.col + cols - 1 } })
    .map((row) => row.map(plainValue));
  return { ...base, spill: { ref: `${base.address}:${a1(address.row + rows - 1, address.col + cols - 1)}`, rows, cols, values } };
}
