/**
 * Generates examples/demo-design.xlsx: the design workbook of an invented product, the output filter of the
 * "PSU2" 48 V → 12 V / 3 A, 400 kHz synchronous buck of a "Fenwick FX-48 field controller". Every value is
 * made up for the demo.
 *
 * Formulas are stored as Excel stores them (add-in functions as _xldudf_HC.…, spilled results as array
 * formulas over their spill range with cached values), so the file reads like one Excel saved. The cached
 * values are computed by the headless engine (the same path as `hc calc --out`).
 *
 * Run: npx ts-node --transpile-only scripts/make-demo.ts [OUT.xlsx]
 */
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';
import ExcelJS from 'exceljs';
import { readWorkbook, recalculate, toStoredFormula, writeRecalculated } from '../src/engine';

type Cell = string | number | boolean | null;

/** Rows of the Ladder sheet: role, kind, value (linked to Parts or computed), tolerance (linked), name. */
const LADDER: Cell[][] = [
  ['Role', 'Kind', 'Value', 'Tol %', 'Name'],
  ['series', 'L', '=Parts!C2', '=Parts!D2', 'L1'],
  ['+', 'R', '=Parts!E2', null, 'L1_DCR'],
  ['shunt', 'C', '=Parts!C3', '=Parts!D3', 'C1'],
  ['+', 'R', '=Parts!E3', null, 'C1_ESR'],
  ['+', 'L', '=Parts!F3', null, 'C1_ESL'],
  ['shunt', 'C', '=Parts!C4', '=Parts!D4', 'C2'],
  ['+', 'R', '=Parts!E4', null, 'C2_ESR'],
  ['+', 'L', '=Parts!F4', null, 'C2_ESL'],
  ['shunt', 'C', '=Parts!C5', '=Parts!D5', 'C3'],
  ['+', 'R', '=Parts!E5', null, 'C3_ESR'],
  ['+', 'L', '=Parts!F5', null, 'C3_ESL'],
  ['shunt', 'R', '=Design!B6/Design!B7', null, 'RLOAD'],
];
export const LADDER_ROWS = LADDER.length - 1;
/** Column (0-based, in the Sweep sheet's values block) of the swept part C1 in the ladder. */
const SWEPT_ROW = 2;
const SWEEP_VALUES = ['22u', '33u', '47u', '68u', '100u', '150u'];

const col = (i: number): string => String.fromCharCode(65 + i);

function sheets(): Record<string, Cell[][]> {
  const sweepHeader: Cell[] = ['C1 value', ...LADDER.slice(1).map((_r, i) => `=Ladder!E${i + 2}`), 'Ripple pp (V)', 'C1 current RMS (A)', 'Within limit'];
  const firstValueCol = 1;
  const lastValueCol = firstValueCol + LADDER_ROWS - 1;
  const sweepRows: Cell[][] = SWEEP_VALUES.map((v, k) => {
    const r = k + 5; // data rows start below the title, a blank row and two header rows
    const values = LADDER.slice(1).map((_row, i) => (i === SWEPT_ROW ? `=$A${r}` : `=Ladder!$C$${i + 2}`));
    const block = `${col(firstValueCol)}${r}:${col(lastValueCol)}${r}`;
    return [
      v,
      ...values,
      `=HC.PKPK(HC.RESPONSE(source_spectrum, ladder, , , ${block}))`,
      `=HC.RMS(HC.RESPONSE(source_spectrum, ladder, "I", "C1", ${block}), TRUE)`,
      `=${col(lastValueCol + 1)}${r}<=Design!$B$12`,
    ];
  });
  return {
    Design: [
      ['Fenwick FX-48 field controller: PSU2 buck output filter'],
      ['Invented demo design (48 V to 12 V, 3 A synchronous buck at 400 kHz); every value here is made up.'],
      [],
      ['Parameter', 'Value', 'Unit', 'Note'],
      ['Input voltage', 48, 'V', 'nominal bus'],
      ['Output voltage', 12, 'V', 'set point'],
      ['Load current', 3, 'A', 'full load, resistive'],
      ['Switching frequency', '400k', 'Hz', 'text code, read by the HC functions'],
      ['Duty cycle', '=B6/B5', '', 'ideal continuous conduction'],
      ['Switch-node edge time (rise = fall)', '6n', 's', ''],
      ['Harmonics in the source spectrum', 400, '', 'up to 160 MHz'],
      ['Output ripple limit, peak to peak', 0.06, 'V', '0.5 % of 12 V'],
      ['L1 saturation current', 5.5, 'A', 'from the (invented) inductor data'],
      ['C1 ripple current rating', 2.2, 'A', 'RMS'],
    ],
    Parts: [
      ['Ref', 'Part', 'Value', 'Tol %', 'DCR / ESR', 'ESL', 'Description'],
      ['L1', 'Inductor', '10u', 20, '9m5', null, 'shielded power inductor, 10 µH, Isat 5.5 A'],
      ['C1', 'Capacitor', '47u', 20, '12m', '1n5', 'polymer aluminium, 16 V'],
      ['C2', 'Capacitor', '4u7', 10, '3m', '400p', 'X7R ceramic, 25 V, 1206'],
      ['C3', 'Capacitor', '100n', 10, '20m', '300p', 'X7R ceramic, 0402, high-frequency decoupling'],
    ],
    Ladder: LADDER,
    Spectrum: [
      ['n', 'Frequency (Hz)', 'Amplitude (V)', 'Phase (deg)'],
      ['=HC.PULSE(0, Design!B5, Design!B9, Design!B8, Design!B11, Design!B10, Design!B10)'],
    ],
    Output: [
      ['n', 'Frequency (Hz)', 'Amplitude (V)', 'Phase (deg)'],
      ['=HC.RESPONSE(source_spectrum, ladder)'],
    ],
    Stress: [
      ['Part', 'I rms (A)', 'I peak (A)', 'V rms (V)', 'V peak (V)', 'Power (W)'],
      ['=HC.STRESS(source_spectrum, ladder)'],
    ],
    Results: [
      ['Result', 'Value', 'Unit', 'How'],
      ['Output voltage, mean', '=HC.MEAN(vout_spectrum)', 'V', 'DC row of the output spectrum'],
      ['Output ripple, peak to peak', '=HC.PKPK(vout_spectrum)', 'V', 'largest minus smallest over a period'],
      ['Output ripple, RMS (AC only)', '=HC.RMS(vout_spectrum, TRUE)', 'V', 'Parseval, DC left out'],
      ['Output voltage, peak', '=HC.PEAK(vout_spectrum)', 'V', ''],
      ['Ripple THD (to its fundamental)', '=HC.THD(vout_spectrum)', '', ''],
      ['L1 current, peak to peak', '=HC.PKPK(HC.RESPONSE(source_spectrum, ladder, "I", "L1"))', 'A', 'harmonic result'],
      ['L1 ripple, small-ripple estimate', '=(Design!B5-Design!B6)*Design!B9/(HC.VALUE(Design!B8)*HC.VALUE(Parts!C2))', 'A', '(Vin − Vout)·D/(f·L)'],
      ['L1 current, peak', '=VLOOKUP("L1", Stress!A2:F13, 3, FALSE)', 'A', 'from HC.STRESS'],
      ['C1 ripple current, RMS', '=VLOOKUP("C1", Stress!A2:F13, 2, FALSE)', 'A', 'from HC.STRESS'],
      ['C2 ripple current, RMS', '=VLOOKUP("C2", Stress!A2:F13, 2, FALSE)', 'A', 'from HC.STRESS'],
      ['Load power', '=VLOOKUP("RLOAD", Stress!A2:F13, 6, FALSE)', 'W', 'from HC.STRESS'],
      ['Input ripple source: switch-node RMS', '=HC.RMS(source_spectrum)', 'V', ''],
      [],
      ['Ripple pp over the tolerance corners', 'Min', 'Nominal', 'Max'],
      ['(every corner of L1, C1, C2, C3 tolerances)', '=HC.SPREAD(source_spectrum, ladder, "pp")'],
    ],
    Sweep: [
      ['Sweep of C1 (bulk output capacitor); the other parts as on the Parts sheet'],
      [],
      [null, 'Ladder values (one per ladder row)'],
      sweepHeader,
      ...sweepRows,
    ],
    Trace: [
      ['Time (s)', 'Output (V)'],
      ['=HC.TRACE(vout_spectrum, 400)'],
    ],
    Checks: [
      ['Label', 'Check', 'Note'],
      ['Output ripple within the limit', '=ripple_pp<=Design!B12', '0.5 % of 12 V'],
      ['Ripple within the limit at every tolerance corner', '=ripple_pp_max<=Design!B12', 'HC.SPREAD over all corners'],
      ['Output mean within 1 % of the set point', '=ABS(vout_mean-Design!B6)<=0.01*Design!B6', 'L1 DCR drop included'],
      ['L1 peak current below saturation', '=il_peak<Design!B13', ''],
      ['C1 ripple current within its rating', '=irms_c1<=Design!B14', ''],
      ['L1 ripple agrees with the small-ripple estimate within 5 %', '=ABS(il_pp/il_pp_estimate-1)<=0.05', 'Erickson & Maksimović ch. 2; TI SLVA477B'],
    ],
  };
}

/** Workbook names: results and the tables the formulas share. */
export const NAMES: Record<string, string> = {
  source_spectrum: 'Spectrum!$A$2:$D$1002',
  vout_spectrum: 'Output!$A$2:$D$1002',
  ladder: `Ladder!$A$2:$E$${LADDER_ROWS + 1}`,
  vout_mean: 'Results!$B$2',
  ripple_pp: 'Results!$B$3',
  ripple_rms: 'Results!$B$4',
  vout_peak: 'Results!$B$5',
  ripple_thd: 'Results!$B$6',
  il_pp: 'Results!$B$7',
  il_pp_estimate: 'Results!$B$8',
  il_peak: 'Results!$B$9',
  irms_c1: 'Results!$B$10',
  irms_c2: 'Results!$B$11',
  load_power: 'Results!$B$12',
  ripple_pp_max: 'Results!$D$16',
};

const WIDTHS: Record<string, number[]> = {
  Design: [38, 12, 6, 36],
  Parts: [6, 11, 8, 7, 10, 8, 46],
  Ladder: [8, 6, 22, 7, 9],
  Results: [44, 22, 10, 36],
  Sweep: [10],
  Checks: [56, 34, 40],
};

function build(): ExcelJS.Workbook {
  const wb = new ExcelJS.Workbook();
  wb.creator = 'harmonic-cells make-demo';
  wb.created = new Date(Date.UTC(2025, 0, 1));
  wb.modified = wb.created;
  for (const [name, rows] of Object.entries(sheets())) {
    const ws = wb.addWorksheet(name);
    rows.forEach((row, r) =>
      row.forEach((v, c) => {
        if (v === null || v === undefined) return;
        const cell = ws.getCell(r + 1, c + 1);
        cell.value = typeof v === 'string' && v.startsWith('=') ? { formula: toStoredFormula(v) } as ExcelJS.CellFormulaValue : v;
      }),
    );
    const headerRow = name === 'Design' ? 4 : name === 'Sweep' ? 4 : 1;
    ws.getRow(headerRow).font = { bold: true };
    if (name === 'Design' || name === 'Sweep') ws.getRow(1).font = { bold: true, size: 13 };
    if (name === 'Results') ws.getRow(15).font = { bold: true };
    (WIDTHS[name] ?? [14, 16, 16, 16, 16, 16]).forEach((w, i) => (ws.getColumn(i + 1).width = w));
  }
  for (const [name, ref] of Object.entries(NAMES)) wb.definedNames.add(ref, name);
  return wb;
}

export async function makeDemo(out: string): Promise<void> {
  const tmpDir = fs.mkdtempSync(path.join(os.tmpdir(), 'hc-demo-'));
  const draft = path.join(tmpDir, 'draft.xlsx');
  try {
    await build().xlsx.writeFile(draft);
    // Cached results as a spreadsheet would save them: recalculated by the engine, spills as array formulas.
    const book = await readWorkbook(draft);
    const { results } = recalculate(book);
    const errors = results.filter((r) => typeof r.value === 'object' && r.value !== null);
    if (errors.length) throw new Error(`demo formulas gave errors: ${errors.map((e) => `${e.sheet}!${e.address} ${JSON.stringify(e.value)}`).join('; ')}`);
    fs.mkdirSync(path.dirname(path.resolve(out)), { recursive: true });
    await writeRecalculated(book, results, out);
  } finally {
    fs.rmSync(tmpDir, { recursive: true, force: true });
  }
}

if (require.main === module) {
  const out = process.argv[2] ?? path.join(__dirname, '..', 'examples', 'demo-design.xlsx');
  makeDemo(out).then(
    () => console.log(`wrote ${out}`),
    (e) => {
      console.error(e);
      process.exitCode = 1;
    },
  );
}
