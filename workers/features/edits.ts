/**
 * Edits of a segmentation (merge, split, remove): the worker keeps each image's base labels (as segmented,
 * or a kinetics mosaic) and replays the page's list of edits on them before measuring, so an undo is a
 * shorter list rather than an inverse edit.
 */
import type { Pipeline } from '../runtime';
import type { RunOptions } from '../../src/app/analyse';
import type { OpenedFile } from '../../src/app/open';
import type { Analysis } from '../../src/core/analysis.types';
import type { LabelImage } from '../../src/core/types';
import type { AnalyzeRequest } from '../protocol';
import type { Session } from '../session';
import { storeBase, storedBase } from '../storage';

/** The base labels of an image: the worker's copy, else the stored one, else null. */
export async function baseLabels(s: Session, id: string): Promise<LabelImage | null> {
  return s.bases.get(id) ?? (await storedBase(id));
}

/** Keeps labels as the base of an image, here and in the session store (a full store only warns). */
export async function keepBase(s: Session, id: string, labels: LabelImage): Promise<void> {
  s.bases.set(id, labels);
  try {
    await storeBase(id, labels);
  } catch (e) {
    console.warn('Tessellab: could not store the labels', e);
  }
}

/**
 * The analysis an analyse request asks for: the base labels measured again (`reuseLabels`, when there
 * are any) or a fresh segmentation that becomes the new base; either way with the request's edits.
 *
 * @returns the analysis, and the new base labels when it segmented afresh (null otherwise)
 */
export async function analyseWithEdits(
  s: Session, p: Pipeline, file: OpenedFile, req: AnalyzeRequest, opts: RunOptions,
): Promise<{ analysis: Analysis; newBase: LabelImage | null }> {
  const ops = req.ops ?? [];
  const base = req.reuseLabels ? await baseLabels(s, req.id) : null;
  if (base) return { analysis: await p.app.remeasure(file, base, ops, req.settings, opts), newBase: null };
  const fresh = await p.app.analyseFile(file, req.settings, opts);
  const newBase = fresh.labels;
  if (!newBase) return { analysis: fresh, newBase: null };
  s.bases.set(req.id, newBase);
  const analysis = ops.length ? await p.app.remeasure(file, newBase, ops, req.settings, opts) : fresh;
  return { analysis, newBase };
}
