/** Frame times from typed values, from a CSV of file,time lines, or from the numbers in the file names. */
import Papa from 'papaparse';
import { CsvError, SeriesError } from '../errors';

function baseName(name: string): string {
  const parts = name.split(/[\\/]/);
  return parts[parts.length - 1]!;
}

/** "stack.tif[3]" -> "stack.tif": the file part of a frame's source. */
function fileOf(source: string): string {
  return baseName(source.replace(/\[\d+\]$/, ''));
}

/**
 * Times typed as a list: numbers separated by commas, semicolons or white space ("0, 30, 60").
 * @throws SeriesError naming the entry that is not a number
 */
export function parseTimesList(text: string): number[] {
  const parts = text.split(/[\s,;]+/).filter((p) => p.length > 0);
  if (parts.length === 0) throw new SeriesError('No times given; type one number per frame, separated by commas.');
  return parts.map((p, i) => {
    const x = Number(p);
    if (!Number.isFinite(x)) throw new SeriesError(`Time ${i + 1} ("${p}") is not a number; type one number per frame, separated by commas.`);
    return x;
  });
}

/**
 * Times from a CSV of `file,time` lines (an optional header line is skipped), matched to the frames by file
 * name (directories ignored). A multi-page file takes its rows in order for its pages, or rows naming
 * `file[page]` (1-based page).
 *
 * @param text the CSV text
 * @param sources each frame's source: a file name, or `file[page]` for a page of a multi-page file
 * @throws CsvError for a malformed line; SeriesError when a frame has no time
 */
export function parseTimesCsv(text: string, sources: string[]): number[] {
  const parsed = Papa.parse<string[]>(text.trim(), { skipEmptyLines: true });
  if (parsed.errors.length) {
    const e = parsed.errors[0]!;
    throw new CsvError(`The times CSV is malformed at row ${(e.row ?? 0) + 1}: ${e.message}; write one "file,time" line per frame.`);
  }
  const exact = new Map<string, number>();
  const byFile = new Map<string, number[]>();
  parsed.data.forEach((row, i) => {
    if (row.length < 2) throw new CsvError(`Line ${i + 1} of the times CSV has ${row.length} field; write "file,time".`);
    const name = row[0]!.trim();
    const t = Number(row[1]!.trim());
    if (!Number.isFinite(t)) {
      if (i === 0) return;
      throw new CsvError(`Line ${i + 1} of the times CSV has time "${row[1]}", which is not a number; write "file,time".`);
    }
    exact.set(baseName(name), t);
    const f = fileOf(name);
    if (!byFile.has(f)) byFile.set(f, []);
    byFile.get(f)!.push(t);
  });
  return sources.map((src, i) => {
    const b = baseName(src);
    if (exact.has(b) && b !== fileOf(src)) return exact.get(b)!;
    const q = byFile.get(fileOf(src));
    if (!q || q.length === 0) throw new SeriesError(`The times CSV has no time for frame ${i + 1} (${src}); add a "${fileOf(src)},time" line.`);
    return q.shift()!;
  });
}

/**
 * Times from the last number in each file name ("quench_012.5min.png" -> 12.5; the extension is ignored).
 * @throws SeriesError when a name has no number, or two frames get the same time (pages of one file)
 */
export function timesFromNames(sources: string[]): number[] {
  const times = sources.map((src, i) => {
    const stem = fileOf(src).replace(/\.[A-Za-z][A-Za-z0-9]*$/, '');
    const nums = stem.match(/\d+(?:\.\d+)?/g);
    if (!nums) throw new SeriesError(`The file name of frame ${i + 1} (${src}) holds no number to read a time from; give the times with --times or a times CSV.`);
    return Number(nums[nums.length - 1]);
  });
  const seen = new Map<number, number>();
  times.forEach((t, i) => {
    if (seen.has(t)) throw new SeriesError(`Frames ${seen.get(t)! + 1} and ${i + 1} both read time ${t} from their names (${sources[seen.get(t)!]}, ${sources[i]}); give the times with --times or a times CSV.`);
    seen.set(t, i);
  });
  return times;
}
