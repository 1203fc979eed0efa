/**
 * The engine's caches of argument values: a range read from the sheet is converted once per change of its
 * cells (kept in HyperFormula's range vertex, values.ts RangeCache), and the table functions parse a stable
 * grid once (functions/parse-memo.ts). Every result must be bit for bit what a fresh engine, or the table
 * called directly, computes; edits anywhere in a cached range must be seen.
 */
import { HyperFormula, RawCellContent } from 'hyperformula';
import { createEngine, engineContext } from '../src/engine';
import { FUNCTION_BY_NAME } from '../src/functions/table';
import { invoke } from '../src/functions/invoke';
import { isStable, markStable, parseOnce } from '../src/functions/parse-memo';
import { spectrumFromTable, spectrumToTable } from '../src/core/spectrum';
import { pulse } from '../src/core/waveforms';

const LADDER: RawCellContent[][] = [
  ['role', 'kind', 'value', 'tol %', 'name'],
  ['series', 'L', 10e-6, 20, 'L1'],
  ['+', 'R', 0.02, 10, 'RL'],
  ['shunt', 'C', 22e-6, null, 'C1'],
  ['+', 'R', 0.005, 10, 'ESR'],
  ['shunt', 'R', 3.3, 5, 'RLOAD'],
];
const SPECTRUM = spectrumToTable(pulse(0, 12, 0.4, 250e3, 30, 20e-9, 20e-9, 0));
const SPEC_TOP = 8; // 0-based sheet row of the constant spectrum table (A9:D39, read as A9:D40)
const ROWS = 4; // formula rows, each with its own values override in G:K

/** Inputs: the ladder at A1:E6, a constant spectrum at A9:D39, overrides and formulas from row 50. */
function sheet(): RawCellContent[][] {
  const rows: RawCellContent[][] = LADDER.map((r) => [...r]);
  while (rows.length < SPEC_TOP) rows.push([]);
  for (const r of SPECTRUM) rows.push([...r]);
  while (rows.length < 49) rows.push([]);
  const spec = `$A$9:$D$${SPEC_TOP + SPECTRUM.length + 1}`; // and one blank row below the table
  for (let k = 0; k < ROWS; k++) {
    const r = 50 + k;
    const scale = 1 + 0.05 * k;
    rows.push([
      `=HC.RMS(HC.RESPONSE(${spec}, $A$1:$E$6, , , G${r}:K${r}))`,
      `=HC.PKPK(HC.RESPONSE(${spec}, $A$1:$E$6, "I"))`,
      null, null, null, null,
      10e-6 * scale, 0.02, 22e-6 / scale, 0.005, 3.3 * scale,
    ]);
  }
  return rows;
}

/** Every value of sheet 0 (formulas computed). */
const values = (hf: HyperFormula): unknown[][] => hf.getSheetValues(0);

/** The same cells built from scratch: what the engine computes with nothing cached. */
function fresh(hf: HyperFormula): unknown[][] {
  const cells = hf.getSheetSerialized(0) as RawCellContent[][];
  // Spilled cells are serialised with their values; a fresh engine must see them empty.
  const rows = cells.map((r, row) =>
    r.map((v, col) => (hf.isCellPartOfArray({ sheet: 0, row, col }) && !hf.doesCellHaveFormula({ sheet: 0, row, col }) ? null : v)),
  );
  return values(createEngine({ S: rows }));
}

function direct(overrideRow: number[]): number {
  const resp = invoke(FUNCTION_BY_NAME.get('RESPONSE')!, [SPECTRUM, LADDER.map((r) => [...r]), null, null, [overrideRow]]);
  if (!resp.ok) throw new Error(resp.message);
  const r = invoke(FUNCTION_BY_NAME.get('RMS')!, [resp.value, null]);
  if (!r.ok) throw new Error(r.message);
  return r.value as number;
}

describe('range cache in the engine', () => {
  it('serves repeated ranges from the cache, with results bit for bit those of the table called directly', () => {
    const hf = createEngine({ S: sheet() });
    const ctx = engineContext(hf);
    const before = ctx.rangeCacheHits;
    // Change a cell outside the ranges that every formula reads: all recompute, the shared ranges are cached.
    hf.setCellContents({ sheet: 0, row: 49, col: 7 }, [[0.021]]);
    expect(ctx.rangeCacheHits).toBeGreaterThan(before);
    for (let k = 1; k < ROWS; k++) {
      const scale = 1 + 0.05 * k;
      expect(hf.getCellValue({ sheet: 0, row: 49 + k, col: 0 })).toBe(direct([10e-6 * scale, 0.02, 22e-6 / scale, 0.005, 3.3 * scale]));
    }
    expect(hf.getCellValue({ sheet: 0, row: 49, col: 0 })).toBe(direct([10e-6, 0.021, 22e-6, 0.005, 3.3]));
    expect(values(hf)).toEqual(fresh(hf));
  });

  it('sees an edit of a value, a blank cell and a text cell inside a cached range', () => {
    const hf = createEngine({ S: sheet() });
    const edits: [number, number, RawCellContent][] = [
      [5, 2, 4.7], // the load's value in the ladder
      [3, 3, 10], // a blank tolerance
      [3, 3, null], // and back to blank
      [1, 4, 'LX'], // a name
      [SPEC_TOP + 3, 2, 0.5], // an amplitude in the spectrum
      [SPEC_TOP + 3, 3, -45], // its phase
    ];
    for (const [row, col, v] of edits) {
      const old = values(hf);
      hf.setCellContents({ sheet: 0, row, col }, [[v]]);
      expect(values(hf)).toEqual(fresh(hf));
      if (col < 4 && row !== 3) expect(values(hf)[49][1]).not.toBe(old[49][1]);
    }
    // The blank row read below the spectrum becomes a harmonic: cells that had no value at all.
    const old = values(hf);
    const n = SPECTRUM.length;
    hf.setCellContents({ sheet: 0, row: SPEC_TOP + n, col: 0 }, [[n, n * 250e3, 0.25, 30]]);
    expect(values(hf)[49][0]).not.toBe(old[49][0]);
    expect(values(hf)[49][1]).not.toBe(old[49][1]);
    expect(values(hf)).toEqual(fresh(hf));
  });

  it('sees rows inserted into and removed from a cached range, and a spilled source that changes', () => {
    const rows = sheet();
    rows[0][13] = 0.4;
    rows[SPEC_TOP][13] = '=HC.PULSE(0, 12, N1, 250000, 30)';
    rows[49][2] = `=HC.RMS(HC.RESPONSE(N9:Q39, $A$1:$E$6))`;
    rows[50][2] = `=HC.PEAK(HC.RESPONSE(N9:Q39, $A$1:$E$6))`;
    // The engine keeps no undo history unless asked (ENGINE_CONFIG); undo must not see stale cached ranges either.
    const hf = createEngine({ S: rows }, { config: { undoLimit: 20 } });
    expect(values(hf)).toEqual(fresh(hf));
    const c50 = hf.getCellValue({ sheet: 0, row: 49, col: 2 });
    hf.setCellContents({ sheet: 0, row: 0, col: 13 }, [[0.3]]);
    expect(hf.getCellValue({ sheet: 0, row: 49, col: 2 })).not.toBe(c50);
    expect(values(hf)).toEqual(fresh(hf));
    hf.addRows(0, [3, 1]);
    hf.setCellContents({ sheet: 0, row: 3, col: 0 }, [['+', 'L', 1e-9, 10, 'ESL']]);
    expect(values(hf)).toEqual(fresh(hf));
    hf.removeRows(0, [3, 1]);
    expect(values(hf)).toEqual(fresh(hf));
    hf.undo();
    expect(values(hf)).toEqual(fresh(hf));
  });
});

describe('parse memo', () => {
  it('parses a stable grid once and returns the very same value; other grids every time', () => {
    let parses = 0;
    const parse = (g: unknown) => {
      parses++;
      return spectrumFromTable(g);
    };
    const grid = SPECTRUM.map((r) => [...r]);
    const a = parseOnce(grid, 'spectrum', parse);
    const b = parseOnce(grid, 'spectrum', parse);
    expect(parses).toBe(2);
    expect(a).not.toBe(b);
    markStable(grid);
    expect(isStable(grid)).toBe(true);
    const c = parseOnce(grid, 'spectrum', parse);
    const d = parseOnce(grid, 'spectrum', parse);
    expect(parses).toBe(3);
    expect(d).toBe(c);
    expect(c).toEqual(spectrumFromTable(grid));
  });

  it('does not keep a parse that throws', () => {
    const bad = [['n', 'f', 'a', 'ph']];
    markStable(bad);
    let parses = 0;
    const parse = (g: unknown) => {
      parses++;
      return spectrumFromTable(g);
    };
    expect(() => parseOnce(bad, 'spectrum', parse)).toThrow();
    expect(() => parseOnce(bad, 'spectrum', parse)).toThrow();
    expect(parses).toBe(2);
  });
});
