/**
 * The inputs of a batch: the paths given on the command line and in `--files-from` lists, made into one
 * sorted list without repeats, each with the name its files get in the output folder, and the part of it
 * that one shard (`--shard I/N`) analyses. Everything here depends only on the list's text, never on the
 * machine, so every machine of a cluster agrees on which shard holds an image and what its files are called.
 */
import { readFile } from 'node:fs/promises';
import { normalize } from 'node:path';
import { SettingsError } from '../core/errors';
import { fileStem } from '../core/export/files';

/** The paths of a list file: one per line (LF or CRLF), blank lines skipped, nothing else trimmed. */
export function parseList(text: string): string[] {
  return text
    .split('\n')
    .map((l) => (l.endsWith('\r') ? l.slice(0, -1) : l))
    .filter((l) => l.trim() !== '');
}

/** Reads a `--files-from` list: a file, or standard input for "-". */
export async function readList(source: string, stdin: NodeJS.ReadableStream = process.stdin): Promise<string[]> {
  if (source === '-') {
    const chunks: Buffer[] = [];
    for await (const c of stdin) chunks.push(typeof c === 'string' ? Buffer.from(c) : (c as Buffer));
    return parseList(Buffer.concat(chunks).toString('utf8'));
  }
  try {
    return parseList(await readFile(source, 'utf8'));
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new SettingsError(code === 'ENOENT' ? `The list ${source} (--files-from) does not exist; check the path.` : `Cannot read the list ${source} (--files-from, ${code ?? 'error'}).`);
  }
}

/** One shard of N: `index` from 1 to `count`. */
export interface Shard {
  index: number;
  count: number;
}

/** "I/N" with 1 ≤ I ≤ N. */
export function parseShard(v: string): Shard {
  const m = /^\s*(\d+)\s*\/\s*(\d+)\s*$/.exec(v);
  const index = m ? Number(m[1]) : NaN;
  const count = m ? Number(m[2]) : NaN;
  if (!m || !Number.isSafeInteger(count) || count < 1 || index < 1 || index > count) {
    throw new SettingsError(`--shard must look like 2/8 (this job's number, from 1, over the number of jobs); got "${v}".`);
  }
  return { index, count };
}

export interface Input {
  /** The path as given, normalised (`./a.png` -> `a.png`). */
  path: string;
  /** The stem of its output files: `<name>.summary.json`, `<name>.cells.csv`, ... */
  name: string;
}

export interface InputPlan {
  /** Every input, sorted by path, each once. */
  inputs: Input[];
  /** Lines for stderr: repeated paths dropped, files renamed to keep them apart. */
  notes: string[];
}

/** Sort order of paths: by UTF-16 code units, the same in every locale. */
const byCodeUnits = (a: string, b: string): number => (a < b ? -1 : a > b ? 1 : 0);

/**
 * The batch's inputs: normalised, each path once, sorted, and named. An input's files are named after its
 * file's stem; when several inputs share a stem (`a.png`, `a.tif`, `sub/a.png`; letter case aside, since
 * many file systems ignore it), the first in sorted order keeps it and the others get `a-2`, `a-3`, ...
 * (a name no other input has), said in the notes, so that no result of a run overwrites another.
 */
export function planInputs(paths: readonly string[]): InputPlan {
  const notes: string[] = [];
  const seen = new Set<string>();
  const unique: string[] = [];
  for (const p of paths) {
    const n = normalize(p);
    if (seen.has(n)) {
      notes.push(`${p}: given more than once; analysed once.`);
      continue;
    }
    seen.add(n);
    unique.push(n);
  }
  unique.sort(byCodeUnits);
  const key = (s: string) => s.toLowerCase();
  const natural = new Set(unique.map((p) => key(fileStem(p))));
  const taken = new Map<string, string>();
  const inputs: Input[] = [];
  for (const path of unique) {
    const stem = fileStem(path);
    let name = stem;
    if (taken.has(key(stem))) {
      let k = 2;
      while (natural.has(key(`${stem}-${k}`)) || taken.has(key(`${stem}-${k}`))) k++;
      name = `${stem}-${k}`;
      notes.push(`${path}: its name is also that of ${taken.get(key(stem))}; its files are named ${name}.*`);
    }
    taken.set(key(name), path);
    inputs.push({ path, name });
  }
  return { inputs, notes };
}

/** The inputs of one shard: every N-th of the sorted list, from the I-th (shards 1..N are disjoint and cover it). */
export function shardOf<T>(items: readonly T[], shard: Shard | null): T[] {
  if (!shard) return [...items];
  return items.filter((_, i) => i % shard.count === shard.index - 1);
}
