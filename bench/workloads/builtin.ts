/**
 * `builtin`: the RMS of the ladder's far-end voltage computed as a sheet user does it today with the
 * spreadsheet's own complex-number functions — one cell per harmonic and element (COMPLEX, IMSUM, IMPRODUCT,
 * IMDIV, IMABS) — against one cell =HC.RMS(HC.RESPONSE(spectrum, ladder)), both in the headless engine.
 * Timed: the recalculation after the load resistor's value changes (every cell of either sheet depends on it).
 * Each sheet is in its own engine in its own worker thread (sheet-worker.ts), which times its own edits.
 */
import { RawCellContent, SimpleCellAddress } from 'hyperformula';
import { a1 } from '../../src/engine/cells';
import { ACROSS, C, L, PLUS, SHUNT } from '../../src/core/ladder';
import { LADDER, LADDER_ROWS, sourceTable } from '../fixtures';
import { benchLine, pairRunners } from '../timing';
import { startSheet } from '../sheet-worker';

const HARMONICS = 200;
const SPEC_TOP = 9; // 0-based row of the spectrum table's DC row
const LOAD_ROW = 1 + LADDER.rows - 1; // 0-based sheet row of the load resistor (last ladder row)

/** Ladder (A1:E7) and the source spectrum (A10:D210) as constants, the same on both sheets. */
function inputs(): RawCellContent[][] {
  const rows: RawCellContent[][] = LADDER_ROWS.map((r) => [...r]);
  while (rows.length < SPEC_TOP) rows.push([]);
  for (const r of sourceTable(HARMONICS)) rows.push([...r]);
  return rows;
}

/** The built-in chain, generated from the ladder table: one column per element, composite, load and divider. */
export function builtinSheet(): { rows: RawCellContent[][]; result: string } {
  const rows = inputs();
  const t = LADDER;
  const value = (i: number): string => `$C$${i + 2}`; // ladder row i's value cell
  let col = 5; // first free column (F)
  const cols: Record<string, number> = {};
  const take = (name: string): number => (cols[name] = col++);
  take('w');
  take('src');
  for (let i = 0; i < t.rows; i++) take(`z${i}`);
  for (let i = 0; i < t.rows; i++) if (t.role[i] === PLUS || t.role[i] === ACROSS) take(`w${i}`);
  const B = t.branches;
  const isShunt = (b: number): boolean => t.role[t.branchStart[b]] === SHUNT;
  let last = B - 1;
  while (last >= 0 && !isShunt(last)) last--;
  for (let b = last - 1; b >= 0; b--) take(`load${b}`);
  for (let b = 0; b < last; b++) if (!isShunt(b)) take(`h${b}`);
  take('out');
  take('abs');
  const at = (name: string, r: number): string => a1(r, cols[name]);
  const composite = (i: number, r: number): string => (t.role[i] === PLUS || t.role[i] === ACROSS ? at(`w${i}`, r) : at(`z${i}`, r));
  const branchCell = (b: number, r: number): string => composite(t.branchStart[b + 1] - 1, r);
  const loadCell = (b: number, r: number): string => (b === last ? branchCell(last, r) : at(`load${b}`, r));
  for (let n = 1; n <= HARMONICS; n++) {
    const r = SPEC_TOP + n;
    const row = rows[r];
    const put = (name: string, f: string): void => {
      row[cols[name]] = f;
    };
    put('w', `=2*PI()*B${r + 1}`);
    put('src', `=COMPLEX(C${r + 1}*COS(RADIANS(D${r + 1})),C${r + 1}*SIN(RADIANS(D${r + 1})))`);
    const w = at('w', r);
    for (let i = 0; i < t.rows; i++) {
      const k = t.kind[i];
      put(`z${i}`, k === L ? `=COMPLEX(0,${w}*${value(i)})` : k === C ? `=IMDIV(1,COMPLEX(0,${w}*${value(i)}))` : `=COMPLEX(${value(i)},0)`);
      if (t.role[i] === PLUS) put(`w${i}`, `=IMSUM(${composite(i - 1, r)},${at(`z${i}`, r)})`);
      if (t.role[i] === ACROSS) {
        const p = composite(i - 1, r), z = at(`z${i}`, r);
        put(`w${i}`, `=IMDIV(IMPRODUCT(${p},${z}),IMSUM(${p},${z}))`);
      }
    }
    for (let b = last - 1; b >= 0; b--) {
      const wb = branchCell(b, r), next = loadCell(b + 1, r);
      put(`load${b}`, isShunt(b) ? `=IMDIV(IMPRODUCT(${wb},${next}),IMSUM(${wb},${next}))` : `=IMSUM(${wb},${next})`);
    }
    let h = '';
    for (let b = 0; b < last; b++) {
      if (isShunt(b)) continue;
      const ratio = `IMDIV(${loadCell(b + 1, r)},${loadCell(b, r)})`;
      put(`h${b}`, h ? `=IMPRODUCT(${h},${ratio})` : `=${ratio}`);
      h = at(`h${b}`, r);
    }
    put('out', `=IMPRODUCT(${at('src', r)},${h || 'COMPLEX(1,0)'})`);
    put('abs', `=IMABS(${at('out', r)})`);
  }
  // DC row, written by hand as a user would for this ladder: L shorts, C opens, a divider RL–RLOAD.
  rows[SPEC_TOP][cols.out] = `=C${SPEC_TOP + 1}*${value(5)}/(${value(5)}+${value(1)})`;
  const absFirst = at('abs', SPEC_TOP + 1), absLast = at('abs', SPEC_TOP + HARMONICS);
  rows[0][col] = `=SQRT(${at('out', SPEC_TOP)}^2+SUMSQ(${absFirst}:${absLast})/2)`;
  return { rows, result: a1(0, col) };
}

export function oursSheet(): { rows: RawCellContent[][]; result: string } {
  const rows = inputs();
  rows[0][6] = `=HC.RMS(HC.RESPONSE(A${SPEC_TOP + 1}:D${SPEC_TOP + 1 + HARMONICS},A1:E${LADDER.rows + 1}))`;
  return { rows, result: 'G1' };
}

const cellAt = (ref: string): SimpleCellAddress => {
  const m = /^([A-Z]+)(\d+)$/.exec(ref)!;
  let c = 0;
  for (const ch of m[1]) c = c * 26 + ch.charCodeAt(0) - 64;
  return { sheet: 0, row: Number(m[2]) - 1, col: c - 1 };
};

export function runBuiltin(log: (s: string) => void): void {
  const b = builtinSheet();
  const o = oursSheet();
  const formulas = b.rows.reduce((k, r) => k + r.filter((c) => typeof c === 'string' && c.startsWith('=')).length, 0);
  const edit = { sheet: 0, row: LOAD_ROW, col: 2 };
  const base = LADDER.value[LADDER.rows - 1];
  // Each sheet in an engine and a heap of its own (sheet-worker.ts), as each would be in its own workbook.
  const sb = startSheet({ rows: b.rows, edit, base, result: cellAt(b.result) });
  const so = startSheet({ rows: o.rows, edit, base, result: cellAt(o.result) });
  // A new value at each edit, so that no cached result can answer (the engine memoises recent calls).
  let kb = 0, ko = 0;
  const check = (k: number): [number, number] => {
    sb.run(1, k);
    so.run(1, k);
    return [sb.value(), so.value()];
  };
  const [vb, vo] = check(0);
  log(`INFO builtin cells=${formulas} rms builtin=${vb} ours=${vo} rel_diff=${(Math.abs(vb - vo) / vo).toExponential(2)}`);
  const r = pairRunners(
    (n) => so.run(n, (ko += n) - n + 1),
    (n) => sb.run(n, (kb += n) - n + 1),
    { reps: 15, warmMs: 3000, gapMs: 100 },
  );
  const [vb2, vo2] = check(4242);
  sb.stop();
  so.stop();
  log(`INFO builtin after edits rms builtin=${vb2} ours=${vo2} rel_diff=${(Math.abs(vb2 - vo2) / vo2).toExponential(2)}`);
  log(benchLine('builtin', r));
}
