/**
 * One production build of the add-in for the Excel tests (excel-*.test.ts, manifest.test.ts,
 * functions-page.test.ts), made with webpack's Node API in a child Node process and cached in the temp
 * directory under a hash of every input, so the test files share one build and an unchanged tree is not
 * rebuilt.
 */
import { execFileSync } from 'child_process';
import * as crypto from 'crypto';
import * as fs from 'fs';
import * as os from 'os';
import * as path from 'path';

export const ROOT = path.join(__dirname, '..', '..');

export interface Build {
  dist: string;
  /** Resource paths of every module webpack put into functions.js. */
  modules: string[];
}

const INPUTS = ['src', 'assets', 'manifest.xml', 'webpack.config.js', 'package-lock.json'];

function listFiles(p: string, out: string[]): void {
  const st = fs.statSync(p);
  if (st.isDirectory()) {
    for (const name of fs.readdirSync(p).sort()) listFiles(path.join(p, name), out);
  } else {
    out.push(p);
  }
}

function inputHash(): string {
  const files: string[] = [];
  for (const rel of INPUTS) {
    const p = path.join(ROOT, rel);
    if (fs.existsSync(p)) listFiles(p, files);
  }
  const h = crypto.createHash('sha256');
  for (const f of files) h.update(path.relative(ROOT, f)).update('\0').update(fs.readFileSync(f)).update('\0');
  return h.digest('hex').slice(0, 16);
}

const BUILD_SCRIPT = `
const fs = require('fs');
const webpack = require('webpack');
const [out, modulesFile] = process.argv.slice(1);
const config = require('./webpack.config.js')({ outputPath: out }, { mode: 'production' });
webpack(config, (err, stats) => {
  if (err || stats.hasErrors()) {
    console.error(err ? String(err.stack || err) : stats.toString('errors-only'));
    process.exit(1);
  }
  const mods = stats.toJson({ all: false, modules: true, nestedModules: true }).modules || [];
  const names = [];
  const walk = (ms) => { for (const m of ms) { names.push(m.nameForCondition || m.name || ''); if (m.modules) walk(m.modules); } };
  walk(mods);
  fs.writeFileSync(modulesFile, JSON.stringify(names));
});
`;

let cached: Build | undefined;

const sleep = (ms: number): void => Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, ms) as unknown as void;

/**
 * Test files run in parallel workers: the first to take the lock (an atomic mkdir) builds, the others wait for
 * its result instead of building the same tree again.
 */
export function buildAddin(): Build {
  if (cached) return cached;
  const base = path.join(os.tmpdir(), 'harmonic-cells-addin-build');
  const dir = path.join(base, inputHash());
  const modulesFile = path.join(dir, 'modules.json');
  const lock = `${dir}.lock`;
  fs.mkdirSync(base, { recursive: true });
  const deadline = Date.now() + 300_000;
  while (!fs.existsSync(modulesFile)) {
    try {
      fs.mkdirSync(lock);
    } catch {
      // someone else is building; a lock older than the build timeout is left from a killed run
      try {
        if (Date.now() - fs.statSync(lock).mtimeMs > 200_000) fs.rmSync(lock, { recursive: true, force: true });
      } catch {
        /* the lock went away meanwhile */
      }
      if (Date.now() > deadline) throw new Error(`timed out waiting for the add-in build in ${dir}`);
      sleep(250);
      continue;
    }
    try {
      if (!fs.existsSync(modulesFile)) build(base, dir);
    } finally {
      fs.rmSync(lock, { recursive: true, force: true });
    }
  }
  cached = { dist: path.join(dir, 'dist'), modules: JSON.parse(fs.readFileSync(modulesFile, 'utf8')) as string[] };
  return cached;
}

function build(base: string, dir: string): void {
  const tmp = fs.mkdtempSync(path.join(base, 'tmp-'));
  try {
    execFileSync(process.execPath, ['-e', BUILD_SCRIPT, path.join(tmp, 'dist'), path.join(tmp, 'modules.json')], {
      cwd: ROOT,
      stdio: ['ignore', 'ignore', 'pipe'],
      timeout: 180_000,
    });
    fs.rmSync(dir, { recursive: true, force: true });
    fs.renameSync(tmp, dir);
  } finally {
    fs.rmSync(tmp, { recursive: true, force: true });
  }
  // builds of older trees are not needed any more
  for (const name of fs.readdirSync(base)) {
    const p = path.join(base, name);
    if (p !== dir && !name.endsWith('.lock') && !name.startsWith('tmp-')) fs.rmSync(p, { recursive: true, force: true });
  }
}
