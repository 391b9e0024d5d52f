/**
 * Real photographs, read as a new user would: the whole pipeline (src/core/image decoding, analyze) with
 * default settings on the sample images of Debian's python3-skimage (fetched by
 * scripts/fetch-real-images.sh into test/fixtures/real/cache), against truth made by a person looking at each
 * image (test/fixtures/real/<name>.truth.json: the count by eye, hand-marked centres, how they were made, and
 * the image's source and licence). Matching a segmented cell to a hand mark is common practice for object
 * counts (trade): a mark is found when it lies in a cell that holds no other mark (and, for marks with a
 * radius, when that cell's centroid and area fit the marked body and no other cell sits on it).
 *
 * Targets (issue 15, "Real micrographs"): coins.png 24 coins as 24 cells, each matched one-to-one, no
 * background cell; every image's count within 5 % of the count by eye. Where a target is not met yet the test
 * asserts today's figure with a looser bound and says which item of the issue would tighten it.
 */
import { describe, expect, it } from 'vitest';
import { analyze } from '../../src/core/analyze';
import type { Analysis } from '../../src/core/analysis.types';
import { loadCv } from '../../src/core/cv/index';
import { segmentBodies } from '../../src/core/segment/bodies';
import { resolveSettings } from '../../src/core/settings';
import { loadRealImage, loadTruth, matchMarks, type RealTruth } from './realTruth';

/** The analysis of a truth file's image (its crop as the field) with default settings but the pattern. */
async function analyseReal(t: RealTruth): Promise<Analysis> {
  const image = await loadRealImage(t.image);
  return analyze({ kind: 'image', image }, { pattern: t.pattern, field: t.marks.crop });
}

/** |count − eye| / eye. */
const off = (count: number, eye: number): number => Math.abs(count - eye) / eye;

describe('real photographs against counts and marks by eye (Debian python3-skimage sample data)', () => {
  it('coins.png, bodies: 24 coins found as 24 cells, each matched one-to-one to its mark, no background cell', async () => {
    const t = loadTruth('coins');
    const a = await analyseReal(t);
    const m = matchMarks(a, t);
    const seg = a.summary['segmentation'] as { polarity: string };
    console.log(`coins.png: ${m.cells} cells for ${t.countByEye} coins; ${m.matched} matched one-to-one; ${m.background} background cells; polarity ${seg.polarity}`);
    expect(seg.polarity).toBe('bright');
    expect(m.cells).toBe(24);
    expect(off(m.cells, t.countByEye)).toBeLessThanOrEqual(0.05);
    // One-to-one: the mark's cell holds no other mark, its centroid is within a quarter of the coin's radius
    // of the mark, its area within 35 % of π r², and no other cell's centroid lies on the coin.
    expect(m.matched).toBe(24);
    expect(m.background).toBe(0);
    expect(m.merged).toBe(0);
    // A good segmentation passes the quality check before the verdict.
    expect(a.summary.quality.ok, a.summary.quality.warnings.join(' ')).toBe(true);
  });

  it('brick.png, walls, the whole wall: "more regular than random", μ₂ reading "more regular", in the stretched frame', async () => {
    // Running bond: each interior brick touches six others, all of about one size, so the side numbers and the
    // areas vary less than random seeding's (derived from the bond). The bricks are long and aligned, so the
    // spacing statistics are computed where the mean brick is round (docs: "How to read the verdict").
    const image = await loadRealImage('brick.png');
    const a = await analyze({ kind: 'image', image }, { pattern: 'walls' });
    const s = a.summary;
    expect(s.quality.ok, s.quality.warnings.join(' ')).toBe(true);
    expect(s.anisotropy!.spacing).toBe('stretched');
    expect(s.randomness.tests.find((t) => t.key === 'mu2')!.reading).toBe('more regular');
    expect(s.randomness.verdict, s.randomness.verdictText).toBe('more regular than random');
  });

  it('cell.png, bodies: one cell, the one marked (a bright cell in a dark halo)', async () => {
    const t = loadTruth('cell');
    const image = await loadRealImage(t.image);
    // One cell still gets its table and summary (issue 15 item 6); the statistics that need more say why.
    const a = await analyze({ kind: 'image', image }, { pattern: 'bodies' });
    expect(a.labels!.count).toBe(1);
    expect(a.summary.cells.count).toBe(1);
    expect(a.summary.randomness.warnings.join(' ')).toMatch(/1 cell cannot be compared with random seeding/);
    // The segmentation step of the same pipeline, to place the one body against the mark.
    const { cv } = await loadCv();
    const seg = segmentBodies(cv, image, resolveSettings({ pattern: 'bodies' }));
    expect(seg.labels.count).toBe(1);
    expect(seg.polarity).toBe('bright');
    let sx = 0;
    let sy = 0;
    let n = 0;
    for (let i = 0; i < seg.labels.labels.length; i++) {
      if (!seg.labels.labels[i]) continue;
      sx += (i % image.width) + 0.5;
      sy += Math.floor(i / image.width) + 0.5;
      n++;
    }
    const [x, y, r] = t.marks.points[0]!;
    console.log(`cell.png: 1 body at (${(sx / n).toFixed(1)}, ${(sy / n).toFixed(1)}), ${n} px² (mark at (${x}, ${y}), π r² = ${Math.round(Math.PI * r! * r!)} px²)`);
    expect(Math.hypot(sx / n - x!, sy / n - y!)).toBeLessThanOrEqual(0.25 * r!);
    expect(Math.abs(n / (Math.PI * r! * r!) - 1)).toBeLessThanOrEqual(0.35);
  });

  it('ihc.png, bodies, a crop of stroma: every marked nucleus found one-to-one; crumbs beside them', async () => {
    const t = loadTruth('ihc');
    const a = await analyseReal(t);
    const m = matchMarks(a, t);
    const seg = a.summary['segmentation'] as { polarity: string };
    console.log(`ihc.png stroma crop: ${m.cells} cells for ${t.countByEye} nuclei by eye; ${m.matched} matched one-to-one; ${m.unmarked} cells on no mark; polarity ${seg.polarity}`);
    expect(seg.polarity).toBe('dark');
    expect(m.matched).toBe(t.marks.points.length);
    expect(m.merged).toBe(0);
    // Target: within 5 % of 17 (16 to 18). Today 28: besides the 17, one cell is the second half of the blob
    // that may be two nuclei (the truth file's doubtful call) and ten are crumbs of 10 to 48 px² beside nuclei
    // of 50 to 300 px²; a smallest cell set from the typical cell size (issue 15 item 3) would drop them.
    expect(m.cells).toBeGreaterThanOrEqual(t.countByEye);
    expect(m.cells).toBeLessThanOrEqual(30);
  });

  it('brick.png, walls, a crop: bricks found one-to-one, but faint head joints merge a few', async () => {
    const t = loadTruth('brick');
    const a = await analyseReal(t);
    const m = matchMarks(a, t);
    const interior = (a.summary['cells'] as { interior: number }).interior;
    console.log(`brick.png crop: ${m.cells} cells (${interior} interior) for ${t.countByEye} bricks (${t.interiorByEye} whole) by eye; ${m.matched} matched one-to-one; ${m.merged} cells holding two marks or more`);
    // Target: within 5 % of 15 (15 exactly). Today 13, 12 of the 15 one-to-one: where a head joint is faint
    // the walls segmentation joins the bricks on either side; walls with gaps (issue 15 item 4) would
    // tighten this.
    expect(m.cells).toBeGreaterThanOrEqual(13);
    expect(m.cells).toBeLessThanOrEqual(t.countByEye);
    expect(m.matched).toBeGreaterThanOrEqual(12);
    expect(m.unmarked).toBe(0);
  });

  it('gravel.png, walls, a crop: today regions span several stones', async () => {
    const t = loadTruth('gravel');
    const a = await analyseReal(t);
    const m = matchMarks(a, t);
    console.log(`gravel.png crop: ${m.cells} cells for ${t.countByEye} stones by eye (${t.countByEyeRange!.join('–')}); ${m.matched} matched one-to-one; ${m.merged} cells holding two marks or more`);
    // Target: within 5 % of 46. Today 18 cells, 4 stones one-to-one: the stones' textured faces and the faint
    // gaps between touching stones do not separate at one threshold, so one region holds several stones;
    // walls that hold up (gaps, textured interiors; issue 15 item 4) would tighten this. The bound keeps
    // today's figure from getting worse, and never more cells than stones.
    expect(m.cells).toBeGreaterThanOrEqual(15);
    expect(m.cells).toBeLessThanOrEqual(t.countByEyeRange![1]);
    expect(m.matched).toBeGreaterThanOrEqual(3);
  });
});
