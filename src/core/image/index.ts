/** Image reading and writing: decoders for PNG, JPEG and TIFF, greyscale conversion, PNG encoding, calibration. */
export { decodeImage, MAX_PIXELS } from './decode';
export type { DecodeOptions } from './decode';
export { encodePng } from './encode';
export { toGrey, greyTo8, LUMA_R, LUMA_G, LUMA_B } from './grey';
export type { InterleavedImage } from './grey';
export { resolvePixelSize } from './calibration';
export type { ResolvedPixelSize } from './calibration';
export { detectFormat } from './sniff';
export type { ImageFormat } from './sniff';
export { MIN_SIDE_PX, checkDimensions } from './limits';
export { readOmePixelSize } from './ome';
