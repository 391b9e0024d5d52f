/** UTF-8 bytes of text appended piece by piece, in one buffer that grows by doubling. */
export class Utf8Builder {
  private buf: Uint8Array;
  private used = 0;
  private readonly enc = new TextEncoder();

  /** @param initialBytes the buffer's first size (a parameter for tests) */
  constructor(initialBytes = 1 << 16) {
    this.buf = new Uint8Array(Math.max(1, initialBytes));
  }

  append(text: string): void {
    // UTF-8 takes at most 3 bytes per UTF-16 code unit (a surrogate pair: 4 bytes for its 2 units).
    const need = this.used + 3 * text.length;
    if (need > this.buf.length) {
      const next = new Uint8Array(Math.max(2 * this.buf.length, need));
      next.set(this.buf.subarray(0, this.used));
      this.buf = next;
    }
    this.used += this.enc.encodeInto(text, this.buf.subarray(this.used)).written;
  }

  /** The bytes so far, in an array of their exact length. */
  bytes(): Uint8Array {
    return this.buf.slice(0, this.used);
  }
}

/**
 * UTF-8 bytes of text given in pieces, gathered into batches of about `batchChars` characters before each
 * encoding: the whole text never becomes one string.
 */
export function utf8OfPieces(pieces: Iterable<string>, batchChars = 1 << 20): Uint8Array {
  const out = new Utf8Builder();
  let batch: string[] = [];
  let chars = 0;
  for (const piece of pieces) {
    batch.push(piece);
    chars += piece.length;
    if (chars >= batchChars) {
      out.append(batch.join(''));
      batch = [];
      chars = 0;
    }
  }
  out.append(batch.join(''));
  return out.bytes();
}
