/**
 * `npm start`: recalculates the demo design workbook (examples/demo-design.xlsx) with the headless engine,
 * prints a readable design report, and writes into out/ the recalculated copy and an SVG chart of the output
 * ripple over one switching period (from the workbook's HC.TRACE spill).
 */
import * as fs from 'fs';
import * as path from 'path';
import { HyperFormula } from 'hyperformula';
import { formatEng } from '../core/units';
import { isErrorValue, plainValue, PlainValue } from '../engine/results';
import { readWorkbook, recalculate, writeRecalculated } from '../engine/workbook';
import { describe, readChecks } from './check';
import { formatValue } from './format';
import { lineChartSvg } from './svg';

/** examples/demo-design.xlsx of the project, found from this file's folder (src/cli or build/src/cli). */
export function demoWorkbookPath(): string {
  for (let dir = __dirname; dir !== path.dirname(dir); dir = path.dirname(dir)) {
    const file = path.join(dir, 'examples', 'demo-design.xlsx');
    if (fs.existsSync(file)) return file;
  }
  throw new Error('examples/demo-design.xlsx not found; generate it with npx ts-node --transpile-only scripts/make-demo.ts');
}
export const DEMO_OUT = 'out';

export interface DemoOutput {
  report: string;
  workbook: string;
  chart: string;
  checksFailed: number;
}

const eng = (v: PlainValue, unit: string, digits = 4): string =>
  typeof v === 'number' ? formatEng(v, unit, digits) : isErrorValue(v) ? describe(v) : formatValue(v);

function named(hf: HyperFormula, name: string): PlainValue {
  const v = hf.getNamedExpressionValue(name);
  return Array.isArray(v) ? plainValue(v[0]?.[0]) : plainValue(v);
}

function sheetRows(hf: HyperFormula, sheet: string): PlainValue[][] {
  const id = hf.getSheetId(sheet);
  return id === undefined ? [] : hf.getSheetValues(id).map((r) => r.map(plainValue));
}

const pad = (s: string, n: number): string => (s.length >= n ? s : s + ' '.repeat(n - s.length));

export async function runDemo(workbookFile = demoWorkbookPath(), outDir = DEMO_OUT): Promise<DemoOutput> {
  const book = await readWorkbook(workbookFile);
  const { hf, results } = recalculate(book);
  const lines: string[] = [];
  const design = sheetRows(hf, 'Design');
  lines.push(String(design[0]?.[0] ?? 'Demo design'), String(design[1]?.[0] ?? ''), '');

  lines.push('Design inputs');
  for (const row of design.slice(4)) {
    if (row[0] === null) continue;
    lines.push(`  ${pad(String(row[0]), 38)} ${pad(formatValue(row[1] ?? null), 10)} ${row[2] ?? ''}`);
  }

  lines.push('', 'Parts (BOM values as written on the Parts sheet)');
  for (const row of sheetRows(hf, 'Parts')) {
    lines.push(`  ${row.slice(0, 6).map((c, i) => pad(formatValue(c ?? null), [5, 10, 7, 6, 10, 6][i])).join(' ')}  ${formatValue(row[6] ?? null)}`);
  }

  lines.push('', 'Results');
  const results_: [string, string, string][] = [
    ['Output voltage, mean', 'vout_mean', 'V'],
    ['Output ripple, peak to peak', 'ripple_pp', 'V'],
    ['Output ripple, RMS (AC only)', 'ripple_rms', 'V'],
    ['Output voltage, peak', 'vout_peak', 'V'],
    ['Ripple THD (to its fundamental)', 'ripple_thd', '%'],
    ['L1 current, peak to peak', 'il_pp', 'A'],
    ['L1 ripple, small-ripple estimate', 'il_pp_estimate', 'A'],
    ['L1 current, peak', 'il_peak', 'A'],
    ['C1 ripple current, RMS', 'irms_c1', 'A'],
    ['C2 ripple current, RMS', 'irms_c2', 'A'],
    ['Load power', 'load_power', 'W'],
    ['Ripple pp, worst tolerance corner', 'ripple_pp_max', 'V'],
  ];
  for (const [label, name, unit] of results_) {
    const v = named(hf, name);
    const shown = unit === '%' && typeof v === 'number' ? `${(100 * v).toFixed(1)} %` : eng(v, unit);
    lines.push(`  ${pad(label, 38)} ${shown}`);
  }

  lines.push('', 'Part stress (HC.STRESS)');
  lines.push(`  ${pad('part', 8)} ${['I rms', 'I peak', 'V rms', 'V peak', 'power'].map((h) => pad(h, 11)).join(' ')}`);
  const stress = sheetRows(hf, 'Stress').slice(1).filter((r) => r[0] !== null);
  // Mean power of an ideal L or C is zero up to rounding; print it as 0 beside the real losses.
  const total = stress.reduce((a, r) => a + (typeof r[5] === 'number' ? Math.abs(r[5]) : 0), 0);
  for (const row of stress) {
    const units = ['A', 'A', 'V', 'V', 'W'];
    const cells = row.slice(1, 6).map((v, i) => (i === 4 && typeof v === 'number' && Math.abs(v) < 1e-12 * total ? 0 : v));
    lines.push(`  ${pad(formatValue(row[0]), 8)} ${cells.map((v, i) => pad(eng(v, units[i], 3), 11)).join(' ')}`);
  }

  lines.push('', 'Sweep of C1 (bulk output capacitor)');
  lines.push(`  ${pad('C1', 8)} ${pad('ripple pp', 12)} ${pad('I_C1 rms', 12)} within limit`);
  const sweep = sheetRows(hf, 'Sweep');
  const header = sweep[3] ?? [];
  const ppCol = header.indexOf('Ripple pp (V)');
  for (const row of sweep.slice(4)) {
    if (row[0] === null || ppCol < 0) continue;
    lines.push(`  ${pad(formatValue(row[0]), 8)} ${pad(eng(row[ppCol], 'V', 3), 12)} ${pad(eng(row[ppCol + 1], 'A', 3), 12)} ${formatValue(row[ppCol + 2])}`);
  }

  lines.push('', 'Checks');
  const checks = readChecks(hf, book.sheetNames)?.checks ?? [];
  for (const c of checks) lines.push(`  ${c.pass ? 'PASS' : 'FAIL'}  ${c.label}${c.pass ? '' : `: ${describe(c.value)}`}`);
  const failed = checks.filter((c) => !c.pass).length;

  fs.mkdirSync(outDir, { recursive: true });
  const workbook = path.join(outDir, 'demo-design.recalculated.xlsx');
  await writeRecalculated(book, results, workbook);
  const chart = path.join(outDir, 'output-ripple.svg');
  fs.writeFileSync(chart, rippleChart(hf));
  lines.push('', `Wrote ${workbook} (recalculated copy) and ${chart} (output ripple over one period).`);
  return { report: `${lines.join('\n')}\n`, workbook, chart, checksFailed: failed };
}

/** The output ripple (value − mean, in mV) over one period, from the Trace sheet's HC.TRACE spill. */
function rippleChart(hf: HyperFormula): string {
  const rows = sheetRows(hf, 'Trace').slice(1).filter((r) => typeof r[0] === 'number' && typeof r[1] === 'number');
  const t = rows.map((r) => (r[0] as number) * 1e6);
  const v = rows.map((r) => r[1] as number);
  const mean = v.reduce((a, b) => a + b, 0) / Math.max(1, v.length);
  return lineChartSvg({
    title: 'PSU2 output ripple over one switching period (HC.TRACE of the output spectrum)',
    xLabel: 'time (µs)',
    yLabel: `output − ${mean.toFixed(4)} V (mV)`,
    x: t,
    y: v.map((x) => (x - mean) * 1e3),
  });
}

if (require.main === module) {
  runDemo().then(
    (r) => {
      process.stdout.write(r.report);
      if (r.checksFailed) process.exitCode = 1;
    },
    (e) => {
      process.stderr.write(`demo: ${e instanceof Error ? e.stack : String(e)}\n`);
      process.exitCode = 1;
    },
  );
}
