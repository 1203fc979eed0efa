/**
 * The built functions.js, run in a Node vm context with a recording stand-in for Excel's CustomFunctions
 * global: it registers exactly the functions of functions.json and each returns what the table returns.
 * Common practice, no source.
 */
import * as fs from 'fs';
import * as path from 'path';
import * as vm from 'vm';
import { invoke } from '../src/functions/invoke';
import { FUNCTIONS, FUNCTION_BY_NAME } from '../src/functions/table';
import { buildAddin, Build } from './support/excel-build';

// eslint-disable-next-line @typescript-eslint/no-require-imports
const { FORBIDDEN } = require('../webpack.config.js') as { FORBIDDEN: string[] };

type Fn = (...args: unknown[]) => unknown;

interface Loaded {
  associated: [string, Fn][];
  ErrorClass: new (code: string, message?: string) => { code: string; message?: string };
}

function loadBundle(dist: string): Loaded {
  const associated: [string, Fn][] = [];
  class StandInError {
    constructor(public code: string, public message?: string) {}
  }
  const context = vm.createContext({
    CustomFunctions: {
      associate: (id: string, fn: Fn) => associated.push([id, fn]),
      Error: StandInError,
      ErrorCode: { invalidValue: '#VALUE!', notAvailable: '#N/A', invalidNumber: '#NUM!' },
    },
  });
  vm.runInContext(fs.readFileSync(path.join(dist, 'functions.js'), 'utf8'), context, { filename: 'functions.js' });
  return { associated, ErrorClass: StandInError };
}

let build: Build;
let loaded: Loaded;
let fn: Map<string, Fn>;

beforeAll(() => {
  build = buildAddin();
  loaded = loadBundle(build.dist);
  fn = new Map(loaded.associated);
}, 180_000);

/** The same call straight through the table, outside the bundle. */
function direct(name: string, args: unknown[]): unknown {
  const r = invoke(FUNCTION_BY_NAME.get(name)!, args);
  if (!r.ok) throw new Error(`expected a value from ${name}: ${r.message}`);
  return r.value;
}

// Invented demo values.
const ladder = [
  ['series', 'L', '22u', 10, 'L1'],
  ['shunt', 'C', '47u', 20, 'C1'],
  ['+', 'R', '15m', 0, 'ESR1'],
];

test('associates exactly the ids of functions.json, once each, and those are the table', () => {
  const meta = JSON.parse(fs.readFileSync(path.join(build.dist, 'functions.json'), 'utf8')) as { functions: { id: string }[] };
  const ids = loaded.associated.map(([id]) => id);
  expect(new Set(ids).size).toBe(ids.length);
  expect([...ids].sort()).toEqual(meta.functions.map((f) => f.id).sort());
  expect([...ids].sort()).toEqual(FUNCTIONS.map((f) => f.name).sort());
});

test('returns what the core returns', () => {
  const pulseArgs = [0, 12, 0.4, 250000, 7, 2e-8, 3e-8, null];
  const spectrum = fn.get('PULSE')!(...pulseArgs);
  expect(spectrum).toEqual(direct('PULSE', pulseArgs));
  expect((spectrum as unknown[]).length).toBe(8);

  expect(fn.get('RMS')!(spectrum, null)).toBe(direct('RMS', [spectrum, null]));
  expect(fn.get('RMS')!(spectrum, true)).toBe(direct('RMS', [spectrum, true]));
  expect(fn.get('IMPEDANCE')!(ladder, [[1000], [100000]], 'rect', null)).toEqual(
    direct('IMPEDANCE', [ladder, [[1000], [100000]], 'rect', null]),
  );
  expect(fn.get('VALUE')!('4k7', null)).toBe(4700);
  expect(fn.get('VALUE')!('100 nF', 'F')).toBeCloseTo(1e-7, 20);

  const a = fn.get('SINE')!(1, 50, null, null);
  const b = fn.get('SINE')!(0.2, 150, 90, null);
  // Excel passes a repeating parameter as one array of its occurrences.
  expect(fn.get('COMBINE')!([a, b])).toEqual(direct('COMBINE', [a, b]));
});

test('bad input gives a CustomFunctions.Error with the right code and a message, never an exception', () => {
  const num = fn.get('PULSE')!(0, 12, 1.5, 1000, 5, null, null, null) as { code: string; message: string };
  expect(num).toBeInstanceOf(loaded.ErrorClass);
  expect(num.code).toBe('#NUM!');
  expect(num.message).toMatch(/duty/);

  const value = fn.get('RMS')!([['x']], null) as { code: string; message: string };
  expect(value).toBeInstanceOf(loaded.ErrorClass);
  expect(value.code).toBe('#VALUE!');
  expect(value.message.length).toBeGreaterThan(10);

  const spectrum = fn.get('SINE')!(1, 50, null, null);
  const na = fn.get('RESPONSE')!(spectrum, ladder, 'I', 'C7', null, null) as { code: string; message: string };
  expect(na).toBeInstanceOf(loaded.ErrorClass);
  expect(na.code).toBe('#N/A');
  expect(na.message).toMatch(/C7/);

  for (const [id, f] of loaded.associated) {
    expect(() => f()).not.toThrow(); // every function called with nothing at all
    expect(() => f({}, [], 'x')).not.toThrow();
    expect(id).toMatch(/^[A-Z]/);
  }
});

test('the bundle holds no engine-only package and nothing from the engine or the CLI', () => {
  expect(build.modules.length).toBeGreaterThan(5);
  expect(build.modules.some((m) => m.includes(`${path.sep}src${path.sep}core${path.sep}`))).toBe(true);
  for (const m of build.modules) {
    for (const p of FORBIDDEN) expect(m).not.toContain(`node_modules${path.sep}${p}${path.sep}`);
    expect(m).not.toMatch(/[\\/]src[\\/](engine|cli)[\\/]/);
  }
  const js = fs.readFileSync(path.join(build.dist, 'functions.js'), 'utf8');
  expect(js).not.toMatch(/HyperFormula|ExcelJS/);
});
