/**
 * The built functions page in headless Chromium, served from 127.0.0.1 with a local stand-in for the Office
 * custom functions runtime script: the bundle loads under the page's Content-Security-Policy, associates the
 * functions, and HC.PULSE / HC.RMS give the numbers the table gives in Node. No request leaves this machine.
 * Common practice, no source.
 */
import * as fs from 'fs';
import * as http from 'http';
import * as os from 'os';
import * as path from 'path';
import type { AddressInfo } from 'net';
import { invoke } from '../src/functions/invoke';
import { FUNCTION_BY_NAME } from '../src/functions/table';
import { buildAddin } from './support/excel-build';

const CHROMIUM = '/usr/bin/chromium';
const OFFICE_CDN = 'https://appsforoffice.microsoft.com/';
const haveChromium = fs.existsSync(CHROMIUM);
if (!haveChromium) {
  console.warn(`functions-page.test.ts skipped: ${CHROMIUM} is absent (apt-get install chromium; CI installs it).`);
}
const describeIfChromium = haveChromium ? describe : describe.skip;

/** Defines the CustomFunctions global the way Excel's runtime script does, recording associations. */
const RUNTIME_STUB = `
window.__hc = { associated: {} };
window.CustomFunctions = {
  associate: function (id, fn) { window.__hc.associated[id] = fn; },
  Error: function (code, message) { this.code = code; this.message = message; },
  ErrorCode: { invalidValue: '#VALUE!', notAvailable: '#N/A', invalidNumber: '#NUM!' }
};
`;

const TYPES: Record<string, string> = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.json': 'application/json',
  '.css': 'text/css',
  '.png': 'image/png',
};

function serve(dir: string): Promise<http.Server> {
  const server = http.createServer((req, res) => {
    const rel = decodeURIComponent(new URL(req.url ?? '/', 'http://127.0.0.1').pathname);
    const file = path.join(dir, path.normalize(rel));
    if (!file.startsWith(dir + path.sep) || !fs.existsSync(file) || !fs.statSync(file).isFile()) {
      res.writeHead(404).end();
      return;
    }
    res.writeHead(200, { 'Content-Type': TYPES[path.extname(file)] ?? 'application/octet-stream' });
    res.end(fs.readFileSync(file));
  });
  return new Promise((resolve) => server.listen(0, '127.0.0.1', () => resolve(server)));
}

function direct(name: string, args: unknown[]): unknown {
  const r = invoke(FUNCTION_BY_NAME.get(name)!, args);
  if (!r.ok) throw new Error(r.message);
  return r.value;
}

describeIfChromium('functions.html in headless Chromium', () => {
  // Loaded only when Chromium is there, so a machine without it never touches the browser driver.
  // eslint-disable-next-line @typescript-eslint/no-require-imports
  const { chromium } = require('playwright-core') as typeof import('playwright-core');
  let server: http.Server;
  let origin: string;
  let userDataDir: string;
  let context: import('playwright-core').BrowserContext;
  let page: import('playwright-core').Page;
  const problems: string[] = [];
  const outside: string[] = [];

  beforeAll(async () => {
    const { dist } = buildAddin();
    server = await serve(dist);
    origin = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
    userDataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'hc-chromium-'));
    context = await chromium.launchPersistentContext(userDataDir, {
      executablePath: CHROMIUM,
      headless: true,
      args: [
        '--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking',
        '--disable-component-update', '--no-first-run', '--disable-sync',
      ],
    });
    // Everything but our server and the stubbed runtime script is refused, so nothing leaves the machine.
    await context.route('**/*', (route) => {
      const url = route.request().url();
      if (url.startsWith(OFFICE_CDN)) {
        return route.fulfill({ status: 200, contentType: 'text/javascript', body: RUNTIME_STUB });
      }
      if (url.startsWith(`${origin}/`)) return route.continue();
      outside.push(url);
      return route.abort();
    });
    page = context.pages()[0] ?? (await context.newPage());
    page.on('pageerror', (e) => problems.push(`page error: ${e.message}`));
    page.on('console', (m) => {
      if (m.type() === 'error') problems.push(`console: ${m.text()}`);
    });
    await page.goto(`${origin}/functions.html`);
    await page.waitForFunction(() => (window as unknown as { __hc?: { associated: Record<string, unknown> } }).__hc?.associated.RMS !== undefined, null, { timeout: 30_000 });
  }, 240_000);

  afterAll(async () => {
    await context?.close();
    await new Promise((resolve) => (server ? server.close(resolve) : resolve(undefined)));
    if (userDataDir) fs.rmSync(userDataDir, { recursive: true, force: true });
  });

  test('loads without errors or Content-Security-Policy violations and associates every function', async () => {
    const ids = await page.evaluate(() => Object.keys((window as unknown as { __hc: { associated: object } }).__hc.associated));
    expect(ids.sort()).toEqual([...FUNCTION_BY_NAME.keys()].sort());
    expect(problems).toEqual([]);
    expect(outside).toEqual([]);
  });

  test('HC.PULSE and HC.RMS through the associated functions give the core numbers', async () => {
    const args = [0, 12, 0.4, 250000, 9, 2e-8, 3e-8, null];
    const got = await page.evaluate((a) => {
      const fns = (window as unknown as { __hc: { associated: Record<string, (...x: unknown[]) => unknown> } }).__hc.associated;
      const spectrum = fns.PULSE(...a);
      return { spectrum, rms: fns.RMS(spectrum, null), acRms: fns.RMS(spectrum, true) };
    }, args);
    // Chromium's JavaScript engine is not Node's: its Math functions may differ in the last bit.
    const spectrum = direct('PULSE', args) as number[][];
    const rows = got.spectrum as number[][];
    expect(rows.length).toBe(spectrum.length);
    rows.forEach((row, i) => row.forEach((x, j) => expect(x).toBeCloseTo(spectrum[i][j], 9)));
    expect(got.rms).toBeCloseTo(direct('RMS', [spectrum, null]) as number, 12);
    expect(got.acRms).toBeCloseTo(direct('RMS', [spectrum, true]) as number, 12);
    expect(got.acRms).toBeLessThan(got.rms as number);
    // mean of a 0-to-12 pulse at 40 % duty is 4.8 (common practice, no source)
    expect((got.spectrum as number[][])[0][2]).toBeCloseTo(4.8, 9);
  });

  test('an error comes back as a CustomFunctions.Error with code and message', async () => {
    const err = await page.evaluate(() => {
      const fns = (window as unknown as { __hc: { associated: Record<string, (...x: unknown[]) => unknown> } }).__hc.associated;
      const e = fns.PULSE(0, 12, 1.5, 1000, 5, null, null, null) as { code: string; message: string };
      return { code: e.code, message: e.message, isError: e instanceof (window as unknown as { CustomFunctions: { Error: new () => object } }).CustomFunctions.Error };
    });
    expect(err.isError).toBe(true);
    expect(err.code).toBe('#NUM!');
    expect(err.message).toMatch(/duty/);
  });

  test('the page policy refuses inline scripts and code from strings', async () => {
    const result = await page.evaluate(async () => {
      const w = window as unknown as { __inline?: number; __timer?: number };
      const s = document.createElement('script');
      s.textContent = 'window.__inline = 1;';
      document.head.appendChild(s);
      // a string timer is compiled by the page itself, so the policy's missing 'unsafe-eval' applies to it
      (setTimeout as unknown as (code: string, ms: number) => void)('window.__timer = 1;', 0);
      await new Promise((resolve) => setTimeout(resolve, 100));
      return { inline: w.__inline ?? null, timer: w.__timer ?? null };
    });
    expect(result).toEqual({ inline: null, timer: null });
    const log = problems.join('\n');
    expect(log).toMatch(/inline script violates the following Content Security Policy/);
    expect(log).toMatch(/'unsafe-eval' is not an allowed source/);
    problems.length = 0; // those refusals were provoked on purpose
  });
});
