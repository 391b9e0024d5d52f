/** Boundary checks shared by the grain size functions. */
import { NoCellsError, SettingsError } from '../errors';
import type { LabelImage, Rect } from '../types';

/** Throws unless the label image is consistent and the field is a whole-pixel rectangle inside it. */
export function checkLabelsAndField(labels: LabelImage, field: Rect): void {
  const { width, height } = labels;
  if (!(width > 0 && height > 0) || labels.labels.length !== width * height) {
    throw new SettingsError(`The label image must hold width x height = ${width} x ${height} labels; got ${labels.labels.length}.`);
  }
  if (labels.count < 1) throw new NoCellsError('No grains in the label image: grain size needs a segmented walls pattern; check the Detect settings.');
  const ok = [field.x0, field.y0, field.x1, field.y1].every(Number.isInteger);
  if (!ok || field.x0 < 0 || field.y0 < 0 || field.x1 > width || field.y1 > height || field.x1 <= field.x0 || field.y1 <= field.y0) {
    throw new SettingsError(
      `The field {x0: ${field.x0}, y0: ${field.y0}, x1: ${field.x1}, y1: ${field.y1}} must be whole pixels inside the ${width} x ${height} image; draw it again or clear it.`,
    );
  }
}
