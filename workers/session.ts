/**
 * What the analysis worker holds between calls: the opened files, each image's current analysis (for
 * edits and exports), its base labels (before edits), the running analyses' abort controllers and the
 * last kinetics run. The feature modules receive it; none keeps state of its own.
 */
import type { OpenedFile } from '../src/app/open';
import type { Analysis } from '../src/core/analysis.types';
import { MissingError } from '../src/core/errors';
import type { FinalMosaic, KineticsResult } from '../src/core/kinetics/index';
import type { GreyImage, LabelImage } from '../src/core/types';
import { storedImage, storedResult } from './storage';

/** The last kinetics run's final frame and mosaic, for "Analyse the final frame as a tessellation". */
export interface LastSeries {
  last: GreyImage;
  mosaic: FinalMosaic;
  result: KineticsResult;
  umPerPx: number | null;
  minCellAreaPx: number;
}

export interface Session {
  opened: Map<string, OpenedFile>;
  current: Map<string, Analysis>;
  bases: Map<string, LabelImage>;
  controllers: Map<string, AbortController>;
  lastSeries: LastSeries | null;
}

export function createSession(): Session {
  return { opened: new Map(), current: new Map(), bases: new Map(), controllers: new Map(), lastSeries: null };
}

/** The opened file of an image. @throws MissingError when it was not opened in this worker */
export function openedFile(s: Session, id: string): OpenedFile {
  const o = s.opened.get(id);
  if (!o) throw new MissingError(`Image ${id} is not open in the worker; open it first.`);
  return o;
}

/** The current analysis of an image, else its stored one, else null. */
export async function findResult(s: Session, id: string): Promise<Analysis | null> {
  return s.current.get(id) ?? (await storedResult(id));
}

/** {@link findResult}, for a call that needs one. @throws MissingError when the image has no result */
export async function resultOf(s: Session, id: string): Promise<Analysis> {
  const a = await findResult(s, id);
  if (!a) throw new MissingError('This image has no result yet; analyse it first.');
  return a;
}

/** The file name of an image (opened, else stored), or its id. */
export async function nameOf(s: Session, id: string): Promise<string> {
  return s.opened.get(id)?.name ?? (await storedImage(id))?.name ?? id;
}
