/** A small argument parser: positional values and --name value / --flag options. */
import { SettingsError } from '../core/errors';
import { parseDecimal, parseWhole } from '../core/numbers';

export interface ParsedArgs {
  positional: string[];
  options: Map<string, string>;
  flags: Set<string>;
}

/**
 * Parses argv. `valued` lists options that take a value; any other --name is a flag.
 * Unknown options are rejected with a message naming them.
 */
export function parseArgs(argv: string[], valued: string[], flags: string[] = []): ParsedArgs {
  const positional: string[] = [];
  const options = new Map<string, string>();
  const set = new Set<string>();
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]!;
    if (a.startsWith('--')) {
      const eq = a.indexOf('=');
      const name = eq > 0 ? a.slice(2, eq) : a.slice(2);
      if (valued.includes(name)) {
        const v = eq > 0 ? a.slice(eq + 1) : argv[++i];
        if (v === undefined) throw new SettingsError(`Option --${name} needs a value.`);
        options.set(name, v);
      } else if (flags.includes(name)) {
        set.add(name);
      } else {
        throw new SettingsError(`Unknown option --${name}; run with --help for the list.`);
      }
    } else positional.push(a);
  }
  return { positional, options, flags: set };
}

/** A positive finite number in decimal notation from an option ("0x10" is not 16), or a SettingsError naming it. */
export function positiveNumber(v: string, name: string): number {
  const x = parseDecimal(v);
  if (!Number.isFinite(x) || x <= 0) throw new SettingsError(`--${name} must be a positive number; got "${v}" (write it in decimal, e.g. 0.65 or 6.5e-1).`);
  return x;
}

/** A positive whole number in plain digits from an option ("1e3", "2.0" and "0x10" are refused). */
export function positiveInt(v: string, name: string): number {
  const x = parseWhole(v);
  if (!Number.isInteger(x) || x <= 0) throw new SettingsError(`--${name} must be a positive whole number; got "${v}" (write it in plain digits).`);
  return x;
}

/** The largest side of a size given on the command line, px (the largest coordinate of a point). */
const MAX_SIDE = 1_000_000_000;

/** "WxH" -> [W, H]. */
export function parseSize(v: string, name = 'size'): [number, number] {
  const m = /^(\d+)x(\d+)$/i.exec(v.trim());
  if (!m) throw new SettingsError(`--${name} must look like 2000x2000 (width x height in px); got "${v}".`);
  const w = Number(m[1]);
  const h = Number(m[2]);
  if (w < 1 || h < 1) throw new SettingsError(`--${name} must be at least 1x1.`);
  if (w > MAX_SIDE || h > MAX_SIDE) throw new SettingsError(`--${name} must be at most ${MAX_SIDE}x${MAX_SIDE} px; got "${v}".`);
  return [w, h];
}
