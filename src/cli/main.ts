import * as fs from 'fs';
import * as path from 'path';
import { MAIN_HELP } from './help';
import { EXIT, Io, processIo, UsageError } from './io';

/** Commands load their modules on use, so `hc eval` does not load the workbook reader. */
const COMMANDS: Record<string, (argv: string[], io: Io) => Promise<number>> = {
  eval: async (argv, io) => (await import('./eval')).runEval(argv, io),
  calc: async (argv, io) => (await import('./calc')).runCalc(argv, io),
  check: async (argv, io) => (await import('./check')).runCheck(argv, io),
};

/** Run `hc` with arguments (without "node hc"); resolves to the exit code. Never throws. */
export async function main(argv: string[], io: Io = processIo): Promise<number> {
  const [command, ...rest] = argv;
  if (command === undefined || command === '--help' || command === '-h' || command === 'help') {
    if (command === 'help' && rest[0] && COMMANDS[rest[0]]) return main([rest[0], '--help'], io);
    io.out(MAIN_HELP);
    return command === undefined ? EXIT.usage : EXIT.ok;
  }
  if (command === '--version' || command === '-v') {
    io.out(`${version()}\n`);
    return EXIT.ok;
  }
  const run = COMMANDS[command];
  if (!run) {
    io.err(`hc: unknown command ${JSON.stringify(command)}; the commands are eval, calc and check (hc --help).\n`);
    return EXIT.usage;
  }
  try {
    return await run(rest, io);
  } catch (e) {
    if (e instanceof UsageError) {
      io.err(`hc ${command}: ${e.message}\n(hc ${command} --help shows the usage)\n`);
      return EXIT.usage;
    }
    io.err(`hc ${command}: ${e instanceof Error ? e.message : String(e)}\n`);
    return EXIT.usage;
  }
}

function version(): string {
  for (let dir = __dirname; dir !== path.dirname(dir); dir = path.dirname(dir)) {
    const file = path.join(dir, 'package.json');
    if (fs.existsSync(file)) {
      const pkg = JSON.parse(fs.readFileSync(file, 'utf8')) as { name?: string; version?: string };
      if (pkg.name === 'harmonic-cells') return `hc (harmonic-cells) ${pkg.version}`;
    }
  }
  return 'hc (harmonic-cells)';
}

/** Entry point for bin/hc.js: sets the exit code once output has been written. */
export function run(argv: string[] = process.argv.slice(2)): void {
  main(argv).then(
    (code) => {
      process.exitCode = code;
    },
    (e) => {
      process.stderr.write(`hc: ${String(e)}\n`);
      process.exitCode = EXIT.usage;
    },
  );
}
