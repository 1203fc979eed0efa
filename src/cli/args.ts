import { UsageError } from './io';

export interface OptionSpec {
  /** Options that take a value (--sheet NAME or --sheet=NAME). */
  values?: string[];
  /** Options that are switches (--json). */
  flags?: string[];
}

export interface Parsed {
  positionals: string[];
  values: Record<string, string>;
  flags: Set<string>;
}

/** A small, strict argument parser: unknown options and missing values are usage errors. */
export function parseArgs(argv: string[], spec: OptionSpec): Parsed {
  const values: Record<string, string> = {};
  const flags = new Set<string>();
  const positionals: string[] = [];
  const valueNames = new Set(spec.values ?? []);
  const flagNames = new Set([...(spec.flags ?? []), 'help']);
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === '--') {
      positionals.push(...argv.slice(i + 1));
      break;
    }
    if (a === '-h') {
      flags.add('help');
      continue;
    }
    // A formula may start with "-" (=-1 is written without the "=" by some shells' users): only --x is an option.
    if (!a.startsWith('--') || a === '--') {
      positionals.push(a);
      continue;
    }
    const eq = a.indexOf('=');
    const name = a.slice(2, eq < 0 ? undefined : eq);
    if (valueNames.has(name)) {
      const v = eq < 0 ? argv[++i] : a.slice(eq + 1);
      if (v === undefined || v === '') throw new UsageError(`--${name} needs a value.`);
      values[name] = v;
    } else if (flagNames.has(name) && eq < 0) {
      flags.add(name);
    } else {
      throw new UsageError(`unknown option ${a}.`);
    }
  }
  return { positionals, values, flags };
}
