#!/usr/bin/env node
/**
 * Serves dist/ on https://localhost:3000 for sideloading the add-in (npm run serve).
 *
 * Certificates come from office-addin-dev-certs (~/.office-addin-dev-certs). It also tries to trust its
 * development CA in the system store; where that fails (Linux without sudo, containers) the server starts
 * anyway and prints how to trust the certificate by hand.
 *
 * Options: --port N (default 3000), --dir PATH (default dist), --no-install (never try to install the CA).
 */
'use strict';
const fs = require('fs');
const https = require('https');
const path = require('path');
const { execFileSync } = require('child_process');

const args = process.argv.slice(2);
const option = (name, fallback) => {
  const i = args.indexOf(name);
  return i >= 0 && i + 1 < args.length ? args[i + 1] : fallback;
};
const PORT = Number(option('--port', process.env.HC_PORT || 3000));
const ROOT = path.resolve(option('--dir', path.join(__dirname, '..', 'dist')));
const TRY_INSTALL = !args.includes('--no-install') && process.env.HC_NO_CA_INSTALL !== '1';

const TYPES = {
  '.html': 'text/html; charset=utf-8',
  '.js': 'text/javascript; charset=utf-8',
  '.json': 'application/json; charset=utf-8',
  '.css': 'text/css; charset=utf-8',
  '.map': 'application/json; charset=utf-8',
  '.xml': 'application/xml; charset=utf-8',
  '.png': 'image/png',
};

/** The project keeps Office-Addin-Scripts usage data off (README): the documented switch, before any use. */
function usageDataOff() {
  try {
    const cli = path.join(path.dirname(require.resolve('office-addin-usage-data/package.json')), 'cli.js');
    execFileSync(process.execPath, [cli, 'off'], { stdio: 'ignore' });
  } catch {
    console.warn('Could not set office-addin-usage-data off; run `npx office-addin-usage-data off` once.');
  }
}

function readCertFiles() {
  // the package's main module does not re-export its defaults, so name the files as they do
  const dir = path.join(require('os').homedir(), '.office-addin-dev-certs');
  return {
    ca: fs.readFileSync(path.join(dir, 'ca.crt')),
    cert: fs.readFileSync(path.join(dir, 'localhost.crt')),
    key: fs.readFileSync(path.join(dir, 'localhost.key')),
    dir,
  };
}

function trustHelp(dir) {
  const ca = path.join(dir, 'ca.crt');
  return [
    `The development CA is not trusted by this system, so browsers will warn about https://localhost:${PORT}.`,
    'Trust it once, then restart the browser:',
    `  Debian/Ubuntu:  sudo cp "${ca}" /usr/local/share/ca-certificates/office-addin-dev-ca.crt && sudo update-ca-certificates`,
    `  Fedora/RHEL:    sudo cp "${ca}" /etc/pki/ca-trust/source/anchors/ && sudo update-ca-trust`,
    `  Chrome/Chromium (NSS, no sudo): certutil -d sql:$HOME/.pki/nssdb -A -t "C,," -n "Office Add-in dev CA" -i "${ca}"`,
    '  Firefox: Settings > Privacy & Security > Certificates > View Certificates > Authorities > Import.',
    `  macOS / Windows: npx office-addin-dev-certs install`,
    `Or open https://localhost:${PORT}/functions.html once and accept the warning; that browser may then load the add-in for the session.`,
  ].join('\n');
}

async function certificates() {
  const devCerts = require('office-addin-dev-certs');
  if (TRY_INSTALL) {
    try {
      const o = await devCerts.getHttpsServerOptions();
      return { ca: o.ca, cert: o.cert, key: o.key, trusted: true };
    } catch (e) {
      console.warn(`Could not install the development CA: ${String(e && e.message ? e.message : e).split('\n')[0]}`);
    }
  }
  let files;
  try {
    files = readCertFiles();
  } catch {
    await devCerts.generateCertificates();
    files = readCertFiles();
  }
  console.warn(trustHelp(files.dir));
  return { ca: files.ca, cert: files.cert, key: files.key, trusted: false };
}

function handler(req, res) {
  let rel;
  try {
    rel = decodeURIComponent(new URL(req.url, 'https://localhost').pathname);
  } catch {
    res.writeHead(400).end('bad request');
    return;
  }
  if (rel.endsWith('/')) rel += 'help.html';
  const file = path.join(ROOT, path.normalize(rel));
  if (!file.startsWith(ROOT + path.sep) || !fs.existsSync(file) || !fs.statSync(file).isFile()) {
    res.writeHead(404, { 'Content-Type': 'text/plain' }).end('not found');
    return;
  }
  res.writeHead(200, {
    'Content-Type': TYPES[path.extname(file)] || 'application/octet-stream',
    // Excel on the web fetches functions.json and functions.js from its own origin.
    'Access-Control-Allow-Origin': '*',
    'Cache-Control': 'no-cache',
    'X-Content-Type-Options': 'nosniff',
  });
  if (req.method === 'HEAD') res.end();
  else fs.createReadStream(file).pipe(res);
}

async function main() {
  if (!fs.existsSync(path.join(ROOT, 'functions.js'))) {
    console.error(`${ROOT} has no build; run npm run build first.`);
    process.exit(1);
  }
  usageDataOff();
  const { ca, cert, key, trusted } = await certificates();
  // localhost may resolve to 127.0.0.1 or ::1; listen on both loopback addresses and nothing else.
  const listening = [];
  for (const host of ['127.0.0.1', '::1']) {
    const server = https.createServer({ ca, cert, key }, handler);
    listening.push(
      new Promise((resolve) => {
        server.once('error', (e) => resolve({ host, error: e }));
        server.listen(PORT, host, () => resolve({ host }));
      }),
    );
  }
  const results = await Promise.all(listening);
  const up = results.filter((r) => !r.error);
  for (const r of results) if (r.error && r.host === '127.0.0.1') console.warn(`Not serving on ${r.host}: ${r.error.message}`);
  if (up.length === 0) {
    console.error(`Cannot serve on port ${PORT}: ${results[0].error.message}`);
    process.exit(1);
  }
  console.log(`Serving ${ROOT} on https://localhost:${PORT}/ (${trusted ? 'trusted' : 'untrusted'} certificate).`);
  console.log(`Manifest: ${path.join(ROOT, 'manifest.xml')}`);
  console.log('Stop with Ctrl+C.');
}

main().catch((e) => {
  console.error(e && e.stack ? e.stack : e);
  process.exit(1);
});
