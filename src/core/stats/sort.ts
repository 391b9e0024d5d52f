/**
 * Ascending sort of positive finite doubles by least-significant-digit radix sort on their bit patterns
 * (IEEE 754 orders positive doubles as their patterns read as unsigned integers; Knuth 1998, The Art of
 * Computer Programming vol. 3, §5.2.5; pub, memory). The result is exactly that of Float64Array.prototype.sort
 * (a sort has one result), in a few linear passes instead of about n log n comparisons: the normalised
 * areas of the random-seeding reference are sorted once per replicate, and this is what that costs.
 */

const LITTLE_ENDIAN = new Uint32Array(Float64Array.of(1).buffer)[1] === 0x3ff00000;
/** Digits of 11, 11 and 10 bits for each 32-bit half, low half first. */
const SHIFTS = [0, 11, 22, 0, 11, 22];
const WIDTHS = [11, 11, 10, 11, 11, 10];
const count = new Int32Array(1 << 11);
let spare = new Float64Array(0);

/**
 * Sorts `a` ascending in place. Values that are not positive and finite (zero, negatives, NaN, infinities)
 * hand the work to Float64Array.prototype.sort, as do big-endian platforms and short arrays.
 */
export function sortPositive(a: Float64Array): void {
  const m = a.length;
  if (m < 256 || !LITTLE_ENDIAN) {
    a.sort();
    return;
  }
  for (let i = 0; i < m; i++) {
    const v = a[i]!;
    if (!(v > 0 && v < Infinity)) {
      a.sort();
      return;
    }
  }
  if (spare.length < m) spare = new Float64Array(m);
  let src: Float64Array = a;
  let dst: Float64Array = spare.subarray(0, m);
  let srcBits = new Uint32Array(src.buffer, src.byteOffset, 2 * m);
  let dstBits = new Uint32Array(dst.buffer, dst.byteOffset, 2 * m);
  for (let p = 0; p < 6; p++) {
    const word = p < 3 ? 0 : 1;
    const shift = SHIFTS[p]!;
    const size = 1 << WIDTHS[p]!;
    const mask = size - 1;
    count.fill(0, 0, size);
    for (let i = 0; i < m; i++) count[(srcBits[2 * i + word]! >>> shift) & mask]!++;
    // A digit that every value shares moves nothing.
    if (count[(srcBits[word]! >>> shift) & mask] === m) continue;
    let sum = 0;
    for (let d = 0; d < size; d++) {
      const c = count[d]!;
      count[d] = sum;
      sum += c;
    }
    for (let i = 0; i < m; i++) dst[count[(srcBits[2 * i + word]! >>> shift) & mask]!++] = src[i]!;
    const t = src;
    src = dst;
    dst = t;
    const tb = srcBits;
    srcBits = dstBits;
    dstBits = tb;
  }
  if (src !== a) a.set(src);
}
