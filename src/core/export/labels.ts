/** The 16-bit label image as PNG, the full image size, 0 outside the field and on walls/background. */
import type { Analysis } from '../analysis.types';
import { TooFewCellsError } from '../errors';
import { encodePng } from '../image/encode';

export function labelsPng(analysis: Analysis): Uint8Array {
  const lab = analysis.labels;
  if (!lab) throw new TooFewCellsError('A points pattern has no label image.');
  if (lab.count > 65535) throw new TooFewCellsError(`${lab.count} cells do not fit a 16-bit label image (at most 65535); analyse a smaller field.`);
  const { width: w, height: h, field: f } = analysis;
  const data = new Uint16Array(w * h);
  for (let y = 0; y < lab.height; y++) {
    const src = y * lab.width;
    const dst = (y + f.y0) * w + f.x0;
    for (let x = 0; x < lab.width; x++) data[dst + x] = lab.labels[src + x]!;
  }
  return encodePng({ width: w, height: h, data, channels: 1, bitDepth: 16 });
}
