/**
 * The command line run in-process (fast): help, usage errors and exit codes, the argument parser, number
 * formatting and the progress bar. The spawned end-to-end tests are in cli.test.ts. Common practice, no source.
 */
import { main } from '../src/cli/main';
import { Io } from '../src/cli/io';
import { parseArgs } from '../src/cli/args';
import { formatNumber } from '../src/cli/format';
import { countHcCalls, createProgress } from '../src/cli/progress';
import { niceTicks, lineChartSvg } from '../src/cli/svg';

function fakeIo(tty = false): Io & { stdout: string; stderr: string } {
  const io = {
    stdout: '',
    stderr: '',
    errIsTTY: tty,
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

describe('hc help and usage', () => {
  it.each([['eval'], ['calc'], ['check']])('hc %s --help prints the usage and exits 0', async (cmd) => {
    const io = fakeIo();
    expect(await main([cmd, '--help'], io)).toBe(0);
    expect(io.stdout).toMatch(new RegExp(`^Usage: hc ${cmd}`));
  });

  it('hc --help lists the commands and exit codes; no arguments is a usage error', async () => {
    const io = fakeIo();
    expect(await main(['--help'], io)).toBe(0);
    expect(io.stdout).toMatch(/hc eval/);
    expect(io.stdout).toMatch(/Exit codes/);
    expect(await main([], fakeIo())).toBe(2);
  });

  it.each([
    [['nope']],
    [['eval']],
    [['eval', '=1', '=2']],
    [['eval', '--bogus', '=1']],
    [['calc']],
    [['calc', 'x.xlsx', '--out']],
    [['calc', '/no/such/file.xlsx']],
    [['check', '/no/such/file.xlsx']],
    [['calc', 'examples/demo-design.xlsx', '--sheet', 'Nope']],
    [['eval', 'this is not a formula(']],
  ])('%j exits 2 with a message on stderr', async (argv) => {
    const io = fakeIo();
    expect(await main(argv, io)).toBe(2);
    expect(io.stderr.length).toBeGreaterThan(0);
    expect(io.stdout).toBe('');
  });

  it('eval --json prints values and errors as JSON', async () => {
    const io = fakeIo();
    expect(await main(['eval', '--json', 'HC.VALUE("2u2")'], io)).toBe(0);
    expect(JSON.parse(io.stdout)).toEqual({ value: 2.2e-6 });
    const bad = fakeIo();
    expect(await main(['eval', '--json', '=HC.VALUE("abc")'], bad)).toBe(3);
    expect(JSON.parse(bad.stdout)).toMatchObject({ error: '#VALUE!' });
  });
});

describe('pieces', () => {
  it('parses options strictly', () => {
    expect(parseArgs(['a.xlsx', '--sheet=S 1', '--json', '--out', 'o.xlsx'], { values: ['sheet', 'out'], flags: ['json'] })).toEqual({
      positionals: ['a.xlsx'],
      values: { sheet: 'S 1', out: 'o.xlsx' },
      flags: new Set(['json']),
    });
    expect(() => parseArgs(['--json=1'], { flags: ['json'] })).toThrow(/unknown option/);
  });

  it('prints numbers as the shortest text that reads back as the same double', () => {
    for (const x of [0.1 + 0.2, 1 / 3, 2.2e-6, 123456789.12345679, 5e-324, -0]) {
      expect(Number(formatNumber(x))).toBe(x === 0 ? 0 : x);
    }
    expect(formatNumber(0.1 + 0.2)).toBe('0.30000000000000004');
  });

  it('draws a progress bar only on a terminal, after a delay, and erases it when done', () => {
    let t = 0;
    const tty = fakeIo(true);
    const p = createProgress(tty, 'recalculating', 4, 400, () => t);
    p.tick();
    expect(tty.stderr).toBe(''); // quick work draws nothing
    t = 1000;
    p.tick();
    expect(tty.stderr).toMatch(/\rrecalculating \[#+\.+\] 50%$/);
    p.done();
    expect(tty.stderr.endsWith('\r\x1b[2K')).toBe(true);
    const piped = fakeIo(false);
    const q = createProgress(piped, 'recalculating', 4, 0, () => (t += 1000));
    q.tick();
    q.done();
    expect(piped.stderr).toBe('');
    expect(countHcCalls(['=HC.PKPK(HC.RESPONSE(a, b))', '=SUM(A1)', '=hc.value("1k")'])).toBe(3);
  });

  it('chooses round chart ticks and writes a well-formed line chart', () => {
    expect(niceTicks(0, 2.5)).toEqual([0, 0.5, 1, 1.5, 2, 2.5]);
    expect(niceTicks(-16.2, 9.7)).toEqual([-20, -15, -10, -5, 0, 5, 10]);
    const svg = lineChartSvg({ title: 'a < b', xLabel: 'x', yLabel: 'y', x: [0, 1, 2], y: [0, 1, 0] });
    expect(svg).toMatch(/^<svg [^>]*xmlns="http:\/\/www.w3.org\/2000\/svg"/);
    expect(svg).toContain('a &lt; b');
    expect(svg.match(/<polyline [^>]*points="([^"]*)"/)![1].split(' ')).toHaveLength(3);
  });
});
