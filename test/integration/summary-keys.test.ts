/**
 * summary.json: the committed JSON Schema is the one generated from the Summary interface; every summary the
 * analyses below produce follows it; the keys the README promises are there; and the values are checked
 * against what each demo image is known to be (the generator's truth).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/core/analyze';
import { decodeImage } from '../../src/core/image/decode';
import { STATISTICS } from '../../src/core/stats/registry';
import type { Summary } from '../../src/core/summary';
// @ts-expect-error -- a plain .mjs module of the project's scripts, without type declarations
import { summarySchema } from '../../scripts/summary-schema.mjs';
import { expectValidAnalysisSummary, expectValidSummary } from '../helpers/summary-schema';

const get = (o: unknown, path: string): unknown => path.split('.').reduce((v: any, k) => (v == null ? undefined : v[k]), o);

async function load(name: string) {
  return decodeImage(new Uint8Array(readFileSync(`sample-images/${name}`)), { name });
}

/** The README's paragraph of summary.json keys. */
const readme = readFileSync('README.md', 'utf8');
const keyParagraph = readme.slice(readme.indexOf('`summary.json` follows the JSON Schema'), readme.indexOf('## Methods and their sources'));
/** Dotted paths the README promises (`a.b|c|d` stands for a.b, a.c, a.d); the statistic keys listed after "by `key`" are not paths. */
function promisedPaths(): string[] {
  const statisticsList = keyParagraph.slice(keyParagraph.indexOf('by `key`:'), keyParagraph.indexOf('; each with'));
  const paths: string[] = [];
  for (const m of keyParagraph.matchAll(/`([A-Za-z_][\w.|]*)`/g)) {
    const token = m[1]!;
    if (statisticsList.includes(`\`${token}\``) || ['key', 'statistic', 'pValue', 'reading'].includes(token) || token.endsWith('.json')) continue;
    if (token.includes('|')) {
      const [head, ...rest] = token.split('|');
      const base = head!.slice(0, head!.lastIndexOf('.') + 1);
      paths.push(head!, ...rest.map((r) => base + r));
    } else paths.push(token);
  }
  return paths;
}

describe('summary.json schema', () => {
  it('the committed docs/summary.schema.json is the one generated from the Summary interface (run scripts/make-summary-schema.mjs)', () => {
    const committed = JSON.parse(readFileSync('docs/summary.schema.json', 'utf8'));
    expect(committed).toEqual(JSON.parse(JSON.stringify(summarySchema())));
  });

  it('the README lists exactly the statistics of the tests table, by key', () => {
    const listed = [...keyParagraph.slice(keyParagraph.indexOf('by `key`:'), keyParagraph.indexOf('; each with')).matchAll(/`(\w+)`/g)].map((m) => m[1]).slice(1);
    expect(listed).toEqual(STATISTICS.filter((s) => s.table).map((s) => s.key));
  });

  it('rejects a summary with a key of the wrong type (the check can fail)', () => {
    expect(() => expectValidSummary({ tessellab: 2, width: 'wide' })).toThrow();
    // A summary without the settings beside it is not a summary.json file.
    expect(() => expectValidSummary({ tessellab: 2 })).toThrow();
  });
});

describe('summary.json keys', () => {
  it('calibrated grains: every documented key, in µm, with a grain size', async () => {
    const img = await load('grains-calibrated.png');
    expect(img.umPerPx).toBeCloseTo(0.5, 6); // stored in the PNG pHYs chunk by the generator
    const a = await analyze({ kind: 'image', image: img.pages[0]! }, { umPerPx: img.umPerPx }, { calibrationSource: 'file' });
    const s: Summary = a.summary;
    expectValidAnalysisSummary(a, 'grains-calibrated');
    const paths = promisedPaths();
    expect(paths.length).toBeGreaterThan(25);
    for (const k of paths) expect(get(s, k), k).not.toBeUndefined();
    expect(s.calibration.source).toBe('file');
    expect(s.units).toEqual({ length: 'um', area: 'um2' });
    const truth = JSON.parse(readFileSync('sample-images/grains-calibrated.truth.json', 'utf8'));
    expect(s.cells.count).toBe(truth.cells);
    // Mean cell area over the cells in the statistics ≈ field area / cells (one cell per seed, docs/check-values.md
    // §1, derived); interior cells are slightly larger on average than all cells (edge cells are cut): 10 %.
    const expected = (1000 * 800 * 0.25) / truth.cells;
    expect(Math.abs(s.area.mean! / expected - 1)).toBeLessThan(0.1);
    // One sample: the summary's area CV and μ₂ are the tests table's statistics.
    expect(s.area.cv).toBe(s.randomness.tests.find((t) => t.key === 'areaCv')!.statistic);
    expect(s.sides.mu2).toBe(s.randomness.tests.find((t) => t.key === 'mu2')!.statistic);
    expect(s.cells.inStatistics).toBe(s.area.n);
    // Random seeds: the verdict must not call them regular or irregular.
    expect(s.randomness.verdict).toBe('consistent with random seeding');
    expect(s.quality.ok).toBe(true);
  });

  it('uncalibrated: umPerPx is null, units are px, and grain size says why it is missing', async () => {
    const img = await load('tissue-regular.png');
    const a = await analyze({ kind: 'image', image: img.pages[0]! }, {});
    expectValidAnalysisSummary(a, 'tissue-regular');
    expect(a.summary.umPerPx).toBeNull();
    expect(a.summary.calibration.source).toBe('none');
    expect(Object.keys(a.columns)).toContain('area_px2');
    expect(get(a.summary, 'grainSize.G')).toBeNull();
    expect(String(get(a.summary, 'grainSize.error'))).toMatch(/pixel size/);
    // Hard-core seeds: the verdict is "more regular than random".
    expect(a.summary.randomness.verdict).toBe('more regular than random');
    expect(a.summary.quality).toMatchObject({ ok: true, warnings: [] });
  });

  it('bodies: side statistics come from the Voronoi tessellation', async () => {
    const img = await load('bodies-touching.png');
    const a = await analyze({ kind: 'image', image: img.pages[0]! }, { pattern: 'bodies' });
    expectValidAnalysisSummary(a, 'bodies-touching');
    expect(a.summary.sides.source).toBe('voronoi');
    expect(a.summary.grainSize).toBeUndefined();
    const truth = JSON.parse(readFileSync('sample-images/bodies-touching.truth.json', 'utf8'));
    expect(Math.abs(a.summary.cells.count - truth.cells) / truth.cells).toBeLessThanOrEqual(0.02);
  });

  it('points with events and no reference: the schema holds, the verdict is null with the reason', async () => {
    const pts = new Float64Array(2 * 300);
    let s = 7;
    const rnd = () => ((s = (s * 16807) % 2147483647) / 2147483647);
    for (let i = 0; i < pts.length; i++) pts[i] = rnd() * 500;
    const events = Float64Array.from({ length: 200 }, () => rnd() * 500);
    const a = await analyze({ kind: 'points', points: pts, width: 500, height: 500 }, { reference: { replicates: 0 } }, { events });
    expectValidAnalysisSummary(a, 'points');
    expect(a.summary.randomness.verdict).toBeNull();
    expect(a.summary.randomness.reference).toBeNull();
    expect(a.summary.randomness.verdictText).toMatch(/reference is missing/);
    expect(get(a.summary, 'events.total')).toBe(100);
  });
});
