/**
 * The fuzzing harness shared by the suite's bounded fuzz test (fuzz.test.ts) and the longer run of
 * scripts/fuzz.ts: valid PNG, JPEG, TIFF and points-CSV files, mutated by fast-check (a general-purpose
 * property-based testing library) with edits that broken and hostile files have — bytes changed, runs
 * repeated, cuts, 32-bit header fields set to extremes, text put into numbers — then opened and analysed
 * as the command line and the web app do. The property: the input either works, or fails with one of our
 * typed errors whose message is one line (naming the file where the file is what is wrong) and never an
 * "Unexpected error".
 */
import { readFileSync } from 'node:fs';
import fc from 'fast-check';
import { zlibSync } from 'fflate';
import jpegJs from 'jpeg-js';
import { encodePng } from '../../../src/core/image/encode';
import { crc32 } from '../../../src/core/image/phys';
import { synthesize } from '../../../src/core/synth/index';
import { tiffFile } from './craft';
import { analyseFile } from '../../../src/app/analyse';
import { openFile } from '../../../src/app/open';
import { TessellabError, describeError } from '../../../src/core/errors';

const IMAGES = new URL('../../fixtures/images/', import.meta.url);

/** A small walls micrograph of the project's generator (96 x 80 px, 30 cells), whose analysis finds cells. */
const cells = synthesize({ pattern: 'walls', cells: 30, width: 96, height: 80, order: 'random', seed: 11, window: true }).image;
const cellsRgba = new Uint8Array(96 * 80 * 4).map((_, i) => (i % 4 === 3 ? 255 : cells.data[i >> 2]!));

/** The micrograph cut into four 64 x 64 tiles (row by row, padded with 0 past the page), each zlib'd. */
function tiles64(): Uint8Array[] {
  const out: Uint8Array[] = [];
  for (let ty = 0; ty < 2; ty++) {
    for (let tx = 0; tx < 2; tx++) {
      const t = new Uint8Array(64 * 64);
      for (let y = 0; y < 64; y++) for (let x = 0; x < 64; x++) {
        const X = tx * 64 + x;
        const Y = ty * 64 + y;
        if (X < 96 && Y < 80) t[y * 64 + x] = cells.data[Y * 96 + X]!;
      }
      out.push(zlibSync(t));
    }
  }
  return out;
}

/**
 * Seeds of each kind: small valid files written by libtiff and ImageMagick (test/fixtures/images/make.sh),
 * and the generator's micrograph written by our PNG encoder, jpeg-js and as a Deflate TIFF.
 */
export const SEEDS: Record<'png' | 'jpeg' | 'tiff' | 'csv', { name: string; bytes: Uint8Array }[]> = {
  png: [
    ...['grey8.png', 'rgb8.png', 'grey8-palette.png', 'grey16.png', 'grey8-phys.png'].map(fixture),
    { name: 'cells.png', bytes: encodePng({ width: 96, height: 80, data: cells.data as Uint8Array, channels: 1, bitDepth: 8 }) },
  ],
  jpeg: [
    ...['grey8.jpg', 'rgb8.jpg'].map(fixture),
    { name: 'cells.jpg', bytes: new Uint8Array(jpegJs.encode({ width: 96, height: 80, data: cellsRgba }, 90).data) },
  ],
  tiff: [
    ...['grey8-lzw.tif', 'grey8-deflate.tif', 'grey8-packbits.tif', 'grey16-tiles-deflate.tif', 'multipage.tif', 'ome-nm.tif', 'res-inch.tif'].map(fixture),
    { name: 'cells.tif', bytes: tiffFile({ width: 96, height: 80, compression: 8, rowsPerStrip: 16, strips: [0, 1, 2, 3, 4].map((k) => zlibSync(cells.data.subarray(k * 16 * 96, (k + 1) * 16 * 96) as Uint8Array)) }).bytes },
    { name: 'cells-tiles.tif', bytes: tiffFile({ width: 96, height: 80, compression: 8, tile: { width: 64, height: 64 }, strips: tiles64() }).bytes },
  ],
  csv: [
    { name: 'points.csv', bytes: new TextEncoder().encode('x,y\n12,30\n40,8\n33,44\n70,21\n55,60\n18,70\n81,77\n64,40\n') },
    { name: 'bare.csv', bytes: new TextEncoder().encode('5.5;6\n20;30.25\n41;9\n30;45\n12;50\n') },
  ],
};

function fixture(name: string): { name: string; bytes: Uint8Array } {
  return { name, bytes: new Uint8Array(readFileSync(new URL(name, IMAGES))) };
}

/** One edit of a file. Offsets and lengths are fractions of the file, so that every edit applies to any size. */
export type Edit =
  | { kind: 'byte'; at: number; value: number }
  | { kind: 'u32'; at: number; value: number; little: boolean }
  | { kind: 'cut'; at: number }
  | { kind: 'repeat'; at: number; length: number; times: number }
  | { kind: 'delete'; at: number; length: number }
  | { kind: 'text'; at: number; text: string };

/** A place in the file, as a fraction, spread evenly (fast-check's default leans to small values). */
const frac = fc.noBias(fc.integer({ min: 0, max: 2 ** 20 - 1 })).map((k) => k / 2 ** 20);

/** Values that header fields of sizes and offsets are broken with. */
const EXTREMES = [0, 1, 2, 0x7f, 0xff, 0x100, 0xffff, 0x10000, 0x7fffffff, 0x80000000, 0xffffffff, 16000, 30000];

export const editArb: fc.Arbitrary<Edit> = fc.oneof(
  { weight: 4, arbitrary: fc.record({ kind: fc.constant('byte' as const), at: frac, value: fc.integer({ min: 0, max: 255 }) }) },
  { weight: 4, arbitrary: fc.record({ kind: fc.constant('u32' as const), at: frac, value: fc.oneof(fc.constantFrom(...EXTREMES), fc.nat()), little: fc.boolean() }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant('cut' as const), at: frac }) },
  { weight: 2, arbitrary: fc.record({ kind: fc.constant('repeat' as const), at: frac, length: fc.integer({ min: 1, max: 64 }), times: fc.integer({ min: 2, max: 50 }) }) },
  { weight: 2, arbitrary: fc.record({ kind: fc.constant('delete' as const), at: frac, length: fc.integer({ min: 1, max: 64 }) }) },
  { weight: 2, arbitrary: fc.record({ kind: fc.constant('text' as const), at: frac, text: fc.constantFrom('0x10', '1e300', '-', '=1+1', ',', '\n', '\r\n', 'NaN', '\0', '"', ';;', ' ', '1e-320', '__proto__') }) },
);

/** Bytes at the start that edits leave alone: the signatures (a broken signature is tested elsewhere). */
const KEEP: Record<string, number> = { png: 8, jpeg: 2, tiff: 4, csv: 0 };

/** The file after its edits, in order; the first `keep` bytes are not touched. */
export function mutate(seed: Uint8Array, edits: readonly Edit[], keep = 0): Uint8Array {
  let b = seed;
  for (const e of edits) {
    const at = Math.min(b.length, keep + Math.floor(e.at * Math.max(0, b.length - keep)));
    switch (e.kind) {
      case 'byte': {
        if (b.length === 0) break;
        b = b.slice();
        b[at] = e.value;
        break;
      }
      case 'u32': {
        if (b.length < 4) break;
        b = b.slice();
        new DataView(b.buffer).setUint32(Math.min(at, b.length - 4), e.value >>> 0, e.little);
        break;
      }
      case 'cut':
        b = b.slice(0, at);
        break;
      case 'repeat': {
        const part = b.subarray(at, at + e.length);
        const out = new Uint8Array(b.length + part.length * (e.times - 1));
        out.set(b.subarray(0, at), 0);
        for (let k = 0; k < e.times; k++) out.set(part, at + k * part.length);
        out.set(b.subarray(at + part.length), at + e.times * part.length);
        b = out;
        break;
      }
      case 'delete': {
        const out = new Uint8Array(b.length - Math.min(e.length, b.length - at));
        out.set(b.subarray(0, at), 0);
        out.set(b.subarray(at + e.length), at);
        b = out;
        break;
      }
      case 'text': {
        const t = new TextEncoder().encode(e.text);
        const out = new Uint8Array(b.length + t.length);
        out.set(b.subarray(0, at), 0);
        out.set(t, at);
        out.set(b.subarray(at), at + t.length);
        b = out;
        break;
      }
    }
  }
  return b;
}

/**
 * The PNG with each chunk's CRC computed again, as a hostile file would carry them (a CRC that does not match
 * stops every other check from being reached). Chunks that run past the end are left as they are.
 */
export function fixPngCrcs(b: Uint8Array): Uint8Array {
  if (b.length < 8) return b;
  const out = b.slice();
  const v = new DataView(out.buffer);
  for (let at = 8; at + 12 <= out.length;) {
    const length = v.getUint32(at);
    if (at + 12 + length > out.length) break;
    v.setUint32(at + 8 + length, crc32(out.subarray(at + 4, at + 8 + length)));
    at += 12 + length;
  }
  return out;
}

/** What one fuzzed input did. */
export interface Outcome {
  /**
   * 'opened' and 'analysed' are fine; 'refused' and 'not analysed' are typed one-line errors of the opening
   * and of the analysis; 'defect' breaks the property.
   */
  result: 'analysed' | 'opened' | 'refused' | 'not analysed' | 'defect';
  message?: string;
}

/**
 * Opens the bytes as the command line does (as an image, or as a points CSV), analyses what opened (the
 * random-seeding reference off, so that a case costs well under a second), and classifies the outcome.
 *
 * @param analyse whether to run the analysis on what opened (the suite does for a share of the cases)
 */
export async function tryInput(kind: keyof typeof SEEDS, name: string, bytes: Uint8Array, analyse: boolean): Promise<Outcome> {
  let stage = 'open';
  try {
    const opened = await openFile(name, bytes, { as: kind === 'csv' ? 'points' : 'image' });
    if (!analyse) return { result: 'opened' };
    stage = 'analyse';
    await analyseFile(opened, { pattern: kind === 'csv' ? 'points' : 'walls', reference: { replicates: 0 } });
    return { result: 'analysed' };
  } catch (e) {
    const message = describeError(e);
    if (!(e instanceof TessellabError)) return { result: 'defect', message: `${stage}: ${message}` };
    if (message.includes('\n') || message.trim() === '') return { result: 'defect', message: `${stage}: not one line: ${JSON.stringify(message)}` };
    // What the opening refuses is the file: its message starts with the file's name.
    if (stage === 'open' && !message.startsWith(`${name}: `)) return { result: 'defect', message: `${stage}: no file name: ${message}` };
    return { result: stage === 'open' ? 'refused' : 'not analysed', message };
  }
}

/** A fuzz case: which seed, its edits, whether to analyse, and (PNG) whether to make the CRCs right again. */
export interface Case {
  seed: number;
  edits: Edit[];
  analyse: boolean;
  fixCrc: boolean;
}

export function caseArb(kind: keyof typeof SEEDS): fc.Arbitrary<Case> {
  return fc.record({
    seed: fc.integer({ min: 0, max: SEEDS[kind].length - 1 }),
    edits: fc.array(editArb, { minLength: 1, maxLength: 4 }),
    analyse: fc.boolean(),
    fixCrc: fc.boolean(),
  });
}

/** The property over one kind of input, and a tally of outcomes. */
export function property(kind: keyof typeof SEEDS, tally: Record<Outcome['result'], number>): fc.IAsyncPropertyWithHooks<[Case]> {
  return fc.asyncProperty(caseArb(kind), async (c) => {
    const seed = SEEDS[kind][c.seed]!;
    const mutated = mutate(seed.bytes, c.edits, KEEP[kind]);
    const bytes = kind === 'png' && c.fixCrc ? fixPngCrcs(mutated) : mutated;
    const name = `fuzz-${seed.name}`;
    const out = await tryInput(kind, name, bytes, c.analyse);
    tally[out.result]++;
    if (out.result === 'defect') throw new Error(`${name} (${bytes.length} bytes): ${out.message}`);
  });
}
