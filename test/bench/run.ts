/**
 * `npm run bench`: the whole job on generated inputs, each case in its own Node process; medians of the
 * runs after a warm-up; a table on stdout, Markdown after it, JSON in bench-results/latest.json.
 *
 * Flags: --runs N (timed runs per case, default 5), --only id,id (cases by id; 'reference' for the reference alone), --browser (also the
 * 16 MP image through the web app's worker in headless Chromium), --browser-runs N (default 2),
 * --no-node (browser part only), --no-huge-pages (the Node cases without the command line's huge-page
 * setting, src/node/hugePages.ts).
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, writeFileSync } from 'node:fs';
import { cpus, loadavg, totalmem } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { STAGES, type CaseResult, type RunTimes } from './stages';
import { wantsHugePages, withHugePages } from '../../src/node/hugePages';
import { defaultCases, imageFile, type BenchCase } from './inputs';
import type { ReferenceCaseResult } from './referenceCase';

const ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '../..');

interface Flags {
  runs: number;
  only: string[] | null;
  browser: boolean;
  browserRuns: number;
  node: boolean;
  hugePages: boolean;
}

function parseFlags(argv: string[]): Flags {
  const f: Flags = { runs: 5, only: null, browser: false, browserRuns: 2, node: true, hugePages: true };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]!;
    if (a === '--runs') f.runs = Math.max(1, Number(argv[++i]));
    else if (a === '--only') f.only = argv[++i]!.split(',');
    else if (a === '--browser') f.browser = true;
    else if (a === '--browser-runs') (f.browserRuns = Math.max(1, Number(argv[++i]))), (f.browser = true);
    else if (a === '--no-node') f.node = false;
    else if (a === '--no-huge-pages') f.hugePages = false;
    else throw new Error(`Unknown flag ${a}; use --runs N, --only id,id, --browser, --browser-runs N, --no-node or --no-huge-pages.`);
  }
  if (!Number.isInteger(f.runs) || !Number.isInteger(f.browserRuns)) throw new Error('--runs and --browser-runs take a whole number.');
  return f;
}

/** The machine the figures were taken on. */
export function machine(): Record<string, unknown> {
  const c = cpus();
  return { cpu: c[0]?.model ?? 'unknown', cores: c.length, node: process.version, platform: `${process.platform} ${process.arch}`, memoryGB: +(totalmem() / 2 ** 30).toFixed(1) };
}

const median = (v: number[]): number => {
  const s = [...v].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
};

export interface CaseSummary {
  id: string;
  label: string;
  cells: number;
  megapixels: number | null;
  /** Median ms per stage, of the analysis and of the total. */
  median: Record<string, number>;
  /** Megapixels per second of the total (images only). */
  mpPerS: number | null;
  peakRssMB: number;
  /** Peak RSS through the first decode and analysis, before any export. */
  peakRssAnalysisMB: number;
  cvLoadMs: number;
  exportErrors: Record<string, string>;
  runs: RunTimes[];
}

function summarise(c: BenchCase, r: CaseResult): CaseSummary {
  const m: Record<string, number> = {};
  for (const s of STAGES) m[s] = median(r.runs.map((x) => x.stages[s]));
  m.analysis = median(r.runs.map((x) => x.analysis));
  m.total = median(r.runs.map((x) => x.total));
  return {
    id: c.id,
    label: c.label,
    cells: r.cells,
    megapixels: r.megapixels,
    median: m,
    mpPerS: r.megapixels ? r.megapixels / (m.total! / 1000) : null,
    peakRssMB: r.peakRss / 2 ** 20,
    peakRssAnalysisMB: r.peakRssAnalysis / 2 ** 20,
    cvLoadMs: r.cvLoad,
    exportErrors: r.exportErrors,
    runs: r.runs,
  };
}

/**
 * The environment of the Node cases: the command line's (src/node/hugePages.ts), so that the figures are
 * those of `tessellab analyze`; with --no-huge-pages, this process's own.
 */
function caseEnvironment(hugePages: boolean): NodeJS.ProcessEnv {
  return hugePages && wantsHugePages(process.env, process.platform) ? withHugePages(process.env) : process.env;
}

function runCase(c: BenchCase, runs: number, caseEnv: NodeJS.ProcessEnv): CaseResult {
  let file: string | null = null;
  if (c.kind === 'image') {
    const t = performance.now();
    const f = imageFile(ROOT, c);
    if (f.made) process.stderr.write(`  generated ${f.path} in ${((performance.now() - t) / 1000).toFixed(1)} s\n`);
    file = f.path;
  }
  const out = execFileSync(process.execPath, ['--expose-gc', '--import', 'tsx/esm', join(ROOT, 'test/bench/case.ts'), JSON.stringify({ c, runs, file })], {
    cwd: ROOT,
    encoding: 'utf8',
    maxBuffer: 64 * 2 ** 20,
    env: caseEnv,
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  return JSON.parse(out.trim().split('\n').pop()!) as CaseResult;
}

/** The reference alone (test/bench/referenceCase.ts) in its own process. */
function runReferenceCases(runs: number, caseEnv: NodeJS.ProcessEnv): ReferenceCaseResult[] {
  const out = execFileSync(process.execPath, ['--import', 'tsx/esm', join(ROOT, 'test/bench/referenceCase.ts'), String(runs)], {
    cwd: ROOT,
    encoding: 'utf8',
    env: caseEnv,
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  return JSON.parse(out.trim().split('\n').pop()!) as ReferenceCaseResult[];
}

const REF_HEAD = ['random-seeding reference (cache off)', 'threads', 'median ms'];

const COLS = ['decode', 'segment', 'measure', 'tessellate', 'statistics', 'grain', 'export', 'analysis', 'total'];
const HEAD = ['case', 'cells', ...COLS.map((c) => `${c} ms`), 'MP/s', 'RSS analysis MB', 'RSS all MB'];

function row(s: CaseSummary): string[] {
  return [s.label, String(s.cells), ...COLS.map((c) => s.median[c]!.toFixed(0)), s.mpPerS === null ? '–' : s.mpPerS.toFixed(1), s.peakRssAnalysisMB.toFixed(0), s.peakRssMB.toFixed(0)];
}

/** A fixed-width text table. */
export function textTable(head: string[], rows: string[][]): string {
  const w = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i]!.length)));
  const line = (r: string[]) => r.map((v, i) => (i === 0 ? v.padEnd(w[i]!) : v.padStart(w[i]!))).join('  ');
  return [line(head), w.map((x) => '-'.repeat(x)).join('  '), ...rows.map(line)].join('\n');
}

/** A GitHub-flavoured Markdown table. */
export function markdownTable(head: string[], rows: string[][]): string {
  return [`| ${head.join(' | ')} |`, `|${head.map((_, i) => (i === 0 ? ' --- ' : ' ---: ')).join('|')}|`, ...rows.map((r) => `| ${r.join(' | ')} |`)].join('\n');
}

interface Target {
  target: string;
  measured: string;
  met: boolean | null;
}

/** The targets, checked against the medians (null = its case was not run). */
function targets(sums: CaseSummary[], browser: Record<string, unknown> | null, refs: ReferenceCaseResult[]): Target[] {
  const by = (id: string) => sums.find((s) => s.id === id);
  const out: Target[] = [];
  for (const r of refs.filter((x) => x.id.endsWith('-3000') && x.threads > 1)) {
    out.push({ target: `default reference, ${r.label.split(',')[0]}, ${r.id.split('-')[0]} layout < 1000 ms`, measured: `${r.medianMs.toFixed(0)} ms`, met: r.medianMs < 1000 });
  }
  const w16 = by('walls-4096');
  if (w16) {
    const a = w16.median.analysis!;
    out.push({ target: '16 MP walls, whole analysis < 2500 ms', measured: `${a.toFixed(0)} ms`, met: a < 2500 });
    const mts = w16.median.measure! + w16.median.tessellate! + w16.median.statistics!;
    out.push({ target: '16 MP walls, measure + tessellate + statistics < 1/4 of the analysis', measured: `${mts.toFixed(0)} ms of ${a.toFixed(0)} ms (${((100 * mts) / a).toFixed(0)} %)`, met: mts < a / 4 });
    out.push({ target: '16 MP walls, peak RSS of decode + analysis < 1024 MB', measured: `${w16.peakRssAnalysisMB.toFixed(0)} MB (${w16.peakRssMB.toFixed(0)} MB with exports and all runs)`, met: w16.peakRssAnalysisMB < 1024 });
  }
  const off = by('walls-4096-reference-off');
  if (off) {
    const a = off.median.analysis!;
    out.push({ target: '(16 MP walls with the reference off, whole analysis < 2500 ms)', measured: `${a.toFixed(0)} ms`, met: a < 2500 });
    // With the reference on, the statistics stage is mostly the wait for the replicates; off, it is the
    // per-cell work the share target is about.
    const mts = off.median.measure! + off.median.tessellate! + off.median.statistics!;
    out.push({ target: '(16 MP walls with the reference off, measure + tessellate + statistics < 1/4)', measured: `${mts.toFixed(0)} ms of ${a.toFixed(0)} ms (${((100 * mts) / a).toFixed(0)} %)`, met: mts < a / 4 });
  }
  for (const [id, lim] of [['points-1000000', 3000], ['points-100000', 400]] as const) {
    const p = by(id);
    if (!p) continue;
    const v = p.median.tessellate! + p.median.measure!;
    out.push({ target: `${p.cells.toLocaleString('en-US')} points: tessellation + per-cell Voronoi figures < ${lim} ms`, measured: `${v.toFixed(0)} ms`, met: v < lim });
  }
  const w1 = by('walls-1024');
  if (w1 && w16) {
    const per = (s: CaseSummary) => s.median.analysis! / s.megapixels!;
    const r = per(w16) / per(w1);
    out.push({ target: 'analysis time per MP, 16 MP / 1 MP < 1.3', measured: `${per(w1).toFixed(0)} → ${per(w16).toFixed(0)} ms/MP (x${r.toFixed(2)})`, met: r < 1.3 });
  }
  const four = browser?.fourMp as { image?: string; totalMs?: number; workerMs?: number | null } | undefined;
  if (four && typeof four.totalMs === 'number') {
    out.push({ target: `(browser, ${four.image}: from choosing the file to the result, cold)`, measured: `${four.totalMs.toFixed(0)} ms (worker ${four.workerMs?.toFixed(0) ?? '–'} ms)`, met: null });
  }
  if (browser && typeof browser.longestTaskMs === 'number') {
    const l = browser.longestTaskMs;
    out.push({ target: 'browser, 16 MP: longest main-thread task < 100 ms', measured: `${l.toFixed(0)} ms`, met: l < 100 });
  }
  return out;
}

async function main(): Promise<void> {
  const flags = parseFlags(process.argv.slice(2));
  const caseEnv = caseEnvironment(flags.hugePages);
  const m: Record<string, unknown> = { ...machine(), glibcTunables: caseEnv.GLIBC_TUNABLES ?? null };
  const load0 = loadavg();
  const started = new Date().toISOString();
  process.stderr.write(`Tessellab benchmark on ${m.cpu}, ${m.cores} cores, Node ${m.node}; load average ${load0.map((x) => x.toFixed(2)).join(' ')}\n`);
  const sums: CaseSummary[] = [];
  if (flags.node) {
    const cases = defaultCases().filter((c) => !flags.only || flags.only.includes(c.id));
    for (const c of cases) {
      process.stderr.write(`${c.label}: ${flags.runs} runs after a warm-up...\n`);
      const s = summarise(c, runCase(c, flags.runs, caseEnv));
      sums.push(s);
      process.stderr.write(`  analysis ${s.median.analysis!.toFixed(0)} ms, total ${s.median.total!.toFixed(0)} ms, peak RSS ${s.peakRssMB.toFixed(0)} MB\n`);
      for (const [k, v] of Object.entries(s.exportErrors)) process.stderr.write(`  export ${k} failed: ${v}\n`);
    }
  }
  let refs: ReferenceCaseResult[] = [];
  if (flags.node && (!flags.only || flags.only.includes('reference'))) {
    process.stderr.write(`random-seeding reference alone: ${flags.runs} runs after a warm-up...\n`);
    refs = runReferenceCases(flags.runs, caseEnv);
  }
  let browser: Record<string, unknown> | null = null;
  if (flags.browser) {
    const { browserBench } = await import('./browser');
    try {
      browser = await browserBench(ROOT, flags.browserRuns);
    } catch (e) {
      browser = { error: e instanceof Error ? e.message : String(e) };
    }
  }
  const load1 = loadavg();
  const rows = sums.map(row);
  const t = targets(sums, browser, refs);
  const memory = m.glibcTunables ? `, GLIBC_TUNABLES=${m.glibcTunables}` : '';
  const machineLine = `${m.cpu}, ${m.cores} cores, Node ${m.node}, ${m.platform}${memory}; load average ${load0[0]!.toFixed(1)} at the start, ${load1[0]!.toFixed(1)} at the end; median of ${flags.runs} runs after a warm-up, opencv.js load excluded.`;
  if (rows.length) {
    process.stdout.write(`\n${textTable(HEAD, rows)}\n\n${machineLine}\n`);
  }
  const refRows = refs.map((r) => [r.label, String(r.threads), r.medianMs.toFixed(0)]);
  if (refRows.length) process.stdout.write(`\n${textTable(REF_HEAD, refRows)}\n`);
  if (browser) process.stdout.write(`\nBrowser (headless Chromium, web worker): ${JSON.stringify(browser)}\n`);
  if (t.length) process.stdout.write(`\n${textTable(['target', 'measured', 'met'], t.map((x) => [x.target, x.measured, x.met === null ? '–' : x.met ? 'yes' : 'NO']))}\n`);
  const md = [rows.length ? markdownTable(HEAD, rows) : '', '', ...(refRows.length ? [markdownTable(REF_HEAD, refRows), ''] : []), `Machine: ${machineLine}`].join('\n');
  process.stdout.write(`\nMarkdown:\n\n${md}\n`);
  const dir = join(ROOT, 'bench-results');
  mkdirSync(dir, { recursive: true });
  writeFileSync(join(dir, 'latest.json'), `${JSON.stringify({ started, finished: new Date().toISOString(), machine: { ...m, loadavgStart: load0, loadavgEnd: load1 }, runs: flags.runs, cases: sums, reference: refs, browser, targets: t }, null, 1)}\n`);
  writeFileSync(join(dir, 'latest.md'), `${md}\n`);
  process.stderr.write(`Wrote ${join(dir, 'latest.json')} and latest.md\n`);
}

await main();
