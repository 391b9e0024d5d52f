/**
 * `tessellab synth --pattern walls|bodies --cells N --size WxH [--order random|regular|clustered] --seed S --out FILE`
 * Writes a synthetic PNG and, beside it, FILE's stem + .truth.json (seeds, cell count, options).
 * --window (walls): the image is a window on a larger tiling, seeds drawn beyond its border too.
 */
import { basename, dirname, extname, join } from 'node:path';
import { SettingsError } from '../../core/errors';
import { encodePng } from '../../core/image/encode';
import { withPixelSize } from '../../core/image/phys';
import { synthesize } from '../../core/synth/index';
import type { SeedOrder } from '../../core/synth/seeds';
import type { Command } from '../main';
import { parseArgs, parseSize, positiveInt, positiveNumber } from '../args';
import { ensureOutDir, writeOut } from '../files';

const USAGE =
  'tessellab synth --pattern walls|bodies --cells N --size WxH [--order random|regular|clustered] --seed S --out FILE.png [--wall-px W] [--noise SD] [--blur-px S] [--um-per-px X] [--light-walls] [--window]';

export const command: Command = {
  name: 'synth',
  summary: 'Write a synthetic micrograph with known truth (the project’s own generator).',
  usage: USAGE,
  async run(argv) {
    const a = parseArgs(argv, ['pattern', 'cells', 'size', 'order', 'seed', 'out', 'wall-px', 'noise', 'blur-px', 'um-per-px'], ['light-walls', 'window']);
    for (const k of ['pattern', 'cells', 'size', 'out']) if (!a.options.has(k)) throw new SettingsError(`--${k} is required. Usage: ${USAGE}`);
    const pattern = a.options.get('pattern')!;
    if (pattern !== 'walls' && pattern !== 'bodies') throw new SettingsError(`--pattern must be walls or bodies; got "${pattern}".`);
    const order = (a.options.get('order') ?? 'random') as SeedOrder;
    if (!['random', 'regular', 'clustered'].includes(order)) throw new SettingsError(`--order must be random, regular or clustered; got "${order}".`);
    const [width, height] = parseSize(a.options.get('size')!);
    const seedText = a.options.get('seed') ?? '1';
    const seed = Number(seedText);
    if (!Number.isInteger(seed) || seed < 0) throw new SettingsError(`--seed must be a whole number ≥ 0; got "${seedText}".`);
    const opt = (k: string) => (a.options.has(k) ? positiveNumber(a.options.get(k)!, k) : undefined);
    const noiseText = a.options.get('noise');
    const noise = noiseText === undefined ? undefined : Number(noiseText);
    if (noise !== undefined && !(noise >= 0)) throw new SettingsError(`--noise must be a number ≥ 0; got "${noiseText}".`);
    const umPerPx = opt('um-per-px');
    const r = synthesize({
      pattern,
      cells: positiveInt(a.options.get('cells')!, 'cells'),
      width,
      height,
      order,
      seed,
      wallPx: opt('wall-px'),
      blurPx: opt('blur-px'),
      noise,
      wallPolarity: a.flags.has('light-walls') ? 'light' : 'dark',
      // A window on a larger tiling (walls): cells reach across the border, as in a micrograph.
      window: a.flags.has('window'),
    });
    const out = a.options.get('out')!;
    if (extname(out).toLowerCase() !== '.png') throw new SettingsError('--out must name a .png file.');
    await ensureOutDir(dirname(out));
    let png = encodePng({ width, height, data: r.image.data, channels: 1, bitDepth: r.image.bitDepth });
    if (umPerPx) png = withPixelSize(png, umPerPx);
    await writeOut(dirname(out), basename(out), png);
    const truth = {
      generator: 'tessellab synth',
      options: r.options,
      umPerPx: umPerPx ?? null,
      cells: r.cells,
      seeds: Array.from(r.seeds, (v) => Math.round(v * 1000) / 1000),
    };
    const truthName = `${basename(out, extname(out))}.truth.json`;
    await writeOut(dirname(out), truthName, JSON.stringify(truth) + '\n');
    process.stderr.write(`wrote ${out} (${width} x ${height} px, ${r.cells} ${pattern === 'walls' ? 'cells' : 'bodies'}) and ${join(dirname(out), truthName)}\n`);
    return 0;
  },
};
