/**
 * `tessellab reference --cells N --size WxH [--replicates R] [--seed S] [--edge-rule exclude|weight]
 *  [--layout seeds|window] [--min-cell-area-px A] [--values]`
 * Prints the random-seeding reference (Monte Carlo in the same field, with the published constants beside
 * it) as JSON on stdout.
 */
import { SettingsError } from '../../core/errors';
import { publishedConstants } from '../../core/reference/constants';
import type { ReferenceLayout } from '../../core/reference/montecarlo';
import { checkReferenceCounts } from '../../core/reference/limits';
import { referenceSummary } from '../../core/reference/summary';
import { parseDecimal, parseWhole } from '../../core/numbers';
import { startReference } from '../../core/reference/parallel';
import { sharedReferencePool } from '../../node/referencePool';
import type { EdgeRule } from '../../core/settings';
import type { Command } from '../main';
import { parseArgs, parseSize, positiveInt } from '../args';

const USAGE =
  'tessellab reference --cells N --size WxH [--replicates R] [--seed S] [--edge-rule exclude|weight] [--layout seeds|window] [--min-cell-area-px A] [--values]';

export const command: Command = {
  name: 'reference',
  summary: 'Print the random-seeding reference (Poisson–Voronoi Monte Carlo in a field of this size) as JSON.',
  usage: USAGE,
  async run(argv) {
    const a = parseArgs(argv, ['cells', 'size', 'replicates', 'seed', 'edge-rule', 'layout', 'min-cell-area-px'], ['values']);
    for (const k of ['cells', 'size']) if (!a.options.has(k)) throw new SettingsError(`--${k} is required. Usage: ${USAGE}`);
    if (a.positional.length) throw new SettingsError(`Unexpected argument "${a.positional[0]}". Usage: ${USAGE}`);
    const cells = positiveInt(a.options.get('cells')!, 'cells');
    const [width, height] = parseSize(a.options.get('size')!);
    const replicates = a.options.has('replicates') ? positiveInt(a.options.get('replicates')!, 'replicates') : 199;
    if (cells < 3) throw new SettingsError(`--cells must be at least 3; got ${cells}.`);
    checkReferenceCounts(cells, replicates, width, height);
    const seedText = a.options.get('seed') ?? '1';
    const seed = parseWhole(seedText);
    if (!Number.isInteger(seed) || seed < 0 || seed > 2 ** 32 - 1) throw new SettingsError(`--seed must be a whole number from 0 to 4294967295; got "${seedText}".`);
    const edgeRule = (a.options.get('edge-rule') ?? 'exclude') as EdgeRule;
    if (edgeRule !== 'exclude' && edgeRule !== 'weight') throw new SettingsError(`--edge-rule must be exclude or weight; got "${edgeRule}".`);
    const layout = (a.options.get('layout') ?? 'seeds') as ReferenceLayout;
    if (layout !== 'seeds' && layout !== 'window') throw new SettingsError(`--layout must be seeds (points, bodies) or window (walls); got "${layout}".`);
    const minText = a.options.get('min-cell-area-px');
    const minCellAreaPx = minText === undefined ? 0 : parseDecimal(minText);
    if (!(minCellAreaPx >= 0) || !Number.isFinite(minCellAreaPx)) throw new SettingsError(`--min-cell-area-px must be a number ≥ 0; got "${minText}".`);

    const t0 = performance.now();
    const ref = await startReference({ cells, field: { x0: 0, y0: 0, x1: width, y1: height }, replicates, seed, edgeRule, minCellAreaPx, layout }, sharedReferencePool()).result();
    const ms = performance.now() - t0;
    const out = { reference: referenceSummary(ref, { includeValues: a.flags.has('values') }), published: publishedConstants(), elapsedMs: Math.round(ms) };
    for (const w of ref.warnings) process.stderr.write(`tessellab reference: ${w}\n`);
    process.stdout.write(JSON.stringify(out, null, 2) + '\n');
    return 0;
  },
};
