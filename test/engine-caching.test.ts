/**
 * The engine's work-saving paths (issue 7): what is computed once, what is kept, and that results stay those
 * of the table. Common practice, no source: expected values come from calling the table through invoke.
 */
import { SimpleCellAddress } from 'hyperformula';
import { createEngine, engineContext } from '../src/engine';
import { callKey, sameArgs } from '../src/engine/memo-key';
import { FUNCTION_BY_NAME } from '../src/functions/table';
import { invoke } from '../src/functions/invoke';

const at = (row: number, col: number, sheet = 0): SimpleCellAddress => ({ sheet, row, col });

function call(name: string, ...args: unknown[]): unknown {
  const r = invoke(FUNCTION_BY_NAME.get(name)!, args);
  if (!r.ok) throw new Error(r.message);
  return r.value;
}

const LADDER = [['series', 'L', '10u'], ['+', 'R', 0.02], ['shunt', 'C', '22u'], ['shunt', 'R', 3.3]];

describe('engine work saving', () => {
  it('a spilled call nested in a scalar one is computed once while the workbook is built, and not sized', () => {
    const calls: string[] = [];
    const hf = createEngine(
      { S: [['=HC.RMS(HC.PULSE(0, 12, 0.25, 400000, B9))'], [], [], [], [], [], [], [], [null, 25]] },
      { onCall: (n) => calls.push(n) },
    );
    expect(calls).toEqual(['PULSE', 'RMS']);
    expect(engineContext(hf).pending.size).toBe(0);
    // No size method ran for the nested call: nothing was computed ahead and kept for the evaluation.
    expect(engineContext(hf).memo.size).toBe(0);
    hf.setCellContents(at(1, 0), [['=HC.RMS(HC.PULSE(0, 12, 0.25, 400000, B9 + 1))']]);
    expect(engineContext(hf).memo.size).toBe(0);
    expect(calls).toEqual(['PULSE', 'RMS', 'PULSE', 'RMS']);
    expect(hf.getCellValue(at(0, 0))).toBe(call('RMS', call('PULSE', 0, 12, 0.25, 400000, 25)));
  });

  it('keeps no results of evaluation alone, only those a size method computed (its evaluation reuses them)', () => {
    const hf = createEngine({
      S: [
        ['=HC.PULSE(0, 12, 0.25, 400000, 9)', null, null, null, '=HC.RMS(HC.RESPONSE(A1:D10, G1:I4, , , G6:J6))', null, ...LADDER[0]],
        [null, null, null, null, null, null, ...LADDER[1]],
        [null, null, null, null, null, null, ...LADDER[2]],
        [null, null, null, null, null, null, ...LADDER[3]],
        [],
        [null, null, null, null, null, null, 1e-5, 0.02, 2.2e-5, 3.3],
      ],
    });
    const ctx = engineContext(hf);
    const kept = (): string[] => [...ctx.memo.values()].map((e) => e.name);
    expect(kept()).toEqual(['PULSE']); // the root spill, sized then evaluated; not the nested RESPONSE
    for (let k = 1; k <= 5; k++) hf.setCellContents(at(5, 9), [[3.3 + k / 10]]);
    expect(kept()).toEqual(['PULSE']);
    const src = call('PULSE', 0, 12, 0.25, 400000, 9);
    const expected = call('RMS', call('RESPONSE', src, LADDER, null, null, [[1e-5, 0.02, 2.2e-5, 3.3 + 5 / 10]]));
    expect(hf.getCellValue(at(0, 4))).toBe(expected);
  });

  it('reads ranges with blanks and numbers alike, and a spilled result passed on unchanged', () => {
    const src = call('PULSE', -1, 1, 0.5, 1000, 7) as number[][];
    const sheet: unknown[][] = [['n', 'f', 'a', 'ph', '=HC.RMS(A1:D12)', '=HC.RMS(HC.RESPONSE(A1:D12, G1:I4))']];
    src.forEach((r, k) => (sheet[k + 2] = [...r])); // a header, a blank row, then the table
    LADDER.forEach((r, k) => ((sheet[k] ??= [])[6] = r[0], (sheet[k] as unknown[])[7] = r[1], (sheet[k] as unknown[])[8] = r[2]));
    const hf = createEngine({ S: sheet as never });
    expect(hf.getCellValue(at(0, 4))).toBe(call('RMS', src));
    expect(hf.getCellValue(at(0, 5))).toBe(call('RMS', call('RESPONSE', src, LADDER)));
  });

  it('builds a workbook of 400 spilled calls that read cells (each re-read once by settleSpills)', () => {
    const sheet: unknown[][] = [];
    for (let r = 0; r < 400; r++) {
      sheet[2 * r] = [`=HC.SINE(F${2 * r + 1}, 50)`, null, null, null, null, r + 1]; // spills A:D, 2 rows
      sheet[2 * r + 1] = [];
    }
    const hf = createEngine({ S: sheet as never });
    expect(engineContext(hf).pending.size).toBe(0);
    expect(hf.getCellValue(at(2 * 399 + 1, 2))).toBe((call('SINE', 400, 50) as number[][])[1][2]);
  });
});

describe('memo keys', () => {
  it('equal arguments give equal keys; a changed cell, shape or type changes the key', () => {
    const a = [[[1, 2], [3, 4]], 'x', null, true];
    const key = callKey('F', a as never);
    expect(callKey('F', [[[1, 2], [3, 4]], 'x', null, true])).toBe(key);
    expect(callKey('G', a as never)).not.toBe(key);
    expect(callKey('F', [[[1, 2], [3, 5]], 'x', null, true])).not.toBe(key);
    expect(callKey('F', [[[1, 2, 3, 4]], 'x', null, true])).not.toBe(key);
    expect(callKey('F', [[[1, 2], [3, 4]], 'x', null, 1])).not.toBe(key);
    expect(callKey('F', [[[1, 2], [3, '4']], 'x', null, true])).not.toBe(key);
    expect(sameArgs(a as never, [[[1, 2], [3, 4]], 'x', null, true])).toBe(true);
    expect(sameArgs([0], [-0])).toBe(false);
    expect(sameArgs([[[NaN]]], [[[NaN]]])).toBe(true);
  });
});
