#!/usr/bin/env node
'use strict';
// The `hc` command: runs the compiled command line (build/src/cli), built by `npm run build:cli`,
// which `npm install` / `npm ci` run through the package's "prepare" script.
let cli;
try {
  cli = require('../build/src/cli/main.js');
} catch (e) {
  if (e && e.code === 'MODULE_NOT_FOUND' && /build[\\/]src[\\/]cli[\\/]main/.test(String(e.message))) {
    process.stderr.write('hc: the command line is not built yet; run `npm run build:cli` in the project folder.\n');
    process.exit(2);
  }
  throw e;
}
cli.run(process.argv.slice(2));
