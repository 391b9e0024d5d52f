/**
 * The demo's result, made ahead of time by the project's own pipeline (the application layer the command
 * line uses) and packed (src/app/snapshot.ts), so the built app shows it before its engine has loaded.
 * The settings are the ones the page gives the demo (defaults with the manifest's, src/ui/samples.ts);
 * the worker adopts the result only when the image and the settings match.
 *
 * Usage: node --import tsx scripts/make-demo-result.ts OUT.bin   (the build runs it: vite.config.ts)
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { openFile } from '../src/app/open';
import { analyseFile } from '../src/app/analyse';
import { greyDigest, packAnalysis } from '../src/app/snapshot';
import { defaultSettings, resolveSettings, type SettingsInput } from '../src/core/settings';
import { sharedReferencePool } from '../src/node/referencePool';
import { manifestSamples } from '../src/ui/samples';

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
const out = process.argv[2];
if (!out) {
  process.stderr.write('usage: make-demo-result.ts OUT.bin\n');
  process.exit(2);
}
const demo = manifestSamples(JSON.parse(readFileSync(join(root, 'sample-images/manifest.json'), 'utf8')))[0];
if (!demo) throw new Error('sample-images/manifest.json names no image');
const bytes = new Uint8Array(readFileSync(join(root, 'sample-images', demo.name)));
const opened = await openFile(demo.name, bytes, { as: 'image' });
if (opened.kind !== 'image') throw new Error(`${demo.name} is not an image`);
const settings = resolveSettings({ ...defaultSettings(), ...demo.settings } as SettingsInput);
const pool = sharedReferencePool();
const analysis = await analyseFile(opened, settings, { referencePool: pool });
writeFileSync(out, packAnalysis(analysis, { name: demo.name, width: opened.width, height: opened.height, greySha256: await greyDigest(opened.image) }));
process.stderr.write(`${demo.name}: ${analysis.summary.cells.count} cells, packed to ${out}\n`);
process.exit(0);
