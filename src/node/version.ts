/** The software version, from package.json: recorded in every summary.json and printed by the command line. */
import { readFileSync } from 'node:fs';

let cached: string | null = null;

/** The package's version, e.g. "0.1.0". */
export function softwareVersion(): string {
  if (cached === null) {
    const pkg = JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { version?: unknown };
    cached = typeof pkg.version === 'string' ? pkg.version : 'unknown';
  }
  return cached;
}
