/**
 * `tessellab merge DIR... --out FILE.csv`: summary.csv of a batch from the per-input `*.summary.json` files
 * in the folders (not their subfolders): a row for every input, analysed or failed with its reason, sorted
 * by input path, units in the column names (src/core/export/summaryTable.ts). For a batch run in shards or
 * in several jobs; the file is written atomically. Exit 0 when every summary.json could be read, failed
 * inputs included (they are rows, not errors of the merge); 1 when one could not.
 */
import { readdir, readFile } from 'node:fs/promises';
import { basename, dirname, join } from 'node:path';
import { SettingsError } from '../../core/errors';
import { isFailedSummary, summaryTableRow, summaryTableText } from '../../core/export/summaryTable';
import type { Command } from '../main';
import { parseArgs } from '../args';
import { ensureOutDir, writeOut } from '../files';

const USAGE = 'tessellab merge DIR... --out FILE.csv   (--out - writes to standard output)';

/** Files read at once (a cluster's network file system answers many small reads faster side by side). */
const PARALLEL_READS = 16;

interface Entry {
  file: string;
  summary: Record<string, unknown>;
}

export const command: Command = {
  name: 'merge',
  summary: 'Make summary.csv from the *.summary.json files that analyze wrote into one or more folders (every input, failed ones with their reason).',
  usage: USAGE,
  async run(argv) {
    const a = parseArgs(argv, ['out']);
    if (a.positional.length === 0) throw new SettingsError(`No folder given. Usage: ${USAGE}`);
    const out = a.options.get('out');
    if (out === undefined) throw new SettingsError(`Say where summary.csv goes with --out FILE.csv (or --out - for standard output). Usage: ${USAGE}`);
    const files: string[] = [];
    for (const dir of a.positional) files.push(...(await summaryFiles(dir)));
    if (files.length === 0) throw new SettingsError(`No *.summary.json in ${a.positional.join(', ')}; run \`tessellab analyze --out DIR\` first, or check the folder.`);
    const entries: Entry[] = [];
    let unreadable = 0;
    let skipped = 0;
    await forEachLimited(files, PARALLEL_READS, async (file) => {
      let s: unknown;
      try {
        s = JSON.parse(await readFile(file, 'utf8'));
      } catch (e) {
        unreadable++;
        const why = e instanceof SyntaxError ? 'is not valid JSON' : `cannot be read (${(e as NodeJS.ErrnoException).code ?? 'error'})`;
        process.stderr.write(`tessellab merge: ${file} ${why}; its input has no row. Analyse it again (analyze --skip-existing redoes only what is missing).\n`);
        return;
      }
      if (!isImageSummary(s)) {
        skipped++;
        process.stderr.write(`tessellab merge: ${file} is not the summary.json of one input; skipped.\n`);
        return;
      }
      entries.push({ file, summary: s });
    });
    const key = (e: Entry) => String(e.summary.input ?? e.summary.image ?? '');
    entries.sort((x, y) => cmp(key(x), key(y)) || cmp(x.file, y.file));
    for (let i = 1; i < entries.length; i++) {
      if (key(entries[i]!) === key(entries[i - 1]!) && key(entries[i]!) !== '') process.stderr.write(`tessellab merge: ${key(entries[i]!)} has results in both ${entries[i - 1]!.file} and ${entries[i]!.file}; both are listed.\n`);
    }
    const text = summaryTableText(entries.map((e) => summaryTableRow(e.summary)));
    if (out === '-') process.stdout.write(text);
    else {
      await ensureOutDir(dirname(out));
      await writeOut(dirname(out), basename(out), text);
    }
    const failed = entries.filter((e) => isFailedSummary(e.summary)).length;
    process.stderr.write(`${out === '-' ? 'summary' : out}: ${entries.length} inputs (${entries.length - failed} analysed, ${failed} failed)${skipped ? `; ${skipped} other files skipped` : ''}.\n`);
    return unreadable ? 1 : 0;
  },
};

const cmp = (a: string, b: string): number => (a < b ? -1 : a > b ? 1 : 0);

/** A summary.json of one input: an analysed image (numeric width) or a failed input (error object). */
function isImageSummary(s: unknown): s is Record<string, unknown> {
  if (s === null || typeof s !== 'object' || Array.isArray(s)) return false;
  const o = s as Record<string, unknown>;
  return typeof o.tessellab === 'number' && (typeof o.width === 'number' || isFailedSummary(o));
}

async function summaryFiles(dir: string): Promise<string[]> {
  let names: string[];
  try {
    names = await readdir(dir);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new SettingsError(code === 'ENOENT' ? `The folder ${dir} does not exist; check the path.` : `Cannot read the folder ${dir} (${code ?? 'error'}).`);
  }
  return names.filter((n) => n.endsWith('.summary.json') && !n.startsWith('.')).sort(cmp).map((n) => join(dir, n));
}

async function forEachLimited<T>(items: readonly T[], limit: number, fn: (item: T) => Promise<void>): Promise<void> {
  let next = 0;
  const lane = async () => {
    while (next < items.length) await fn(items[next++]!);
  };
  await Promise.all(Array.from({ length: Math.min(limit, items.length) }, lane));
}
