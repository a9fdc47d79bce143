const BLOCK_SIZE = 1 << 16;

/**
 * An append-only list of numbers kept in fixed blocks of 65,536, so growing it never copies what is
 * already stored (a doubling array would hold up to three times the data while it copies).
 * Nothing is allocated before the first push. Float64 or Int32 values (row numbers).
 * @example const a = new ChunkedArray('float64'); a.push(1.5); a.get(0) // 1.5
 */
export class ChunkedArray {
  readonly kind: 'float64' | 'int32';
  #blocks: (Float64Array | Int32Array)[] = [];
  #current: Float64Array | Int32Array | null = null;
  #position = BLOCK_SIZE;
  #length = 0;

  constructor(kind: 'float64' | 'int32') {
    this.kind = kind;
  }

  #newBlock(): Float64Array | Int32Array {
    const block = this.kind === 'float64' ? new Float64Array(BLOCK_SIZE) : new Int32Array(BLOCK_SIZE);
    this.#blocks.push(block);
    return block;
  }

  /** Number of values pushed. */
  get length(): number {
    return this.#length;
  }

  /** Append one value. */
  push(value: number): void {
    if (this.#position === BLOCK_SIZE) {
      this.#current = this.#newBlock();
      this.#position = 0;
    }
    this.#current![this.#position++] = value;
    this.#length++;
  }

  /** Value at index (0-based, < length). */
  get(index: number): number {
    return this.#blocks[index >>> 16][index & (BLOCK_SIZE - 1)];
  }

  /** Drop every value and its memory. */
  clear(): void {
    this.#blocks = [];
    this.#current = null;
    this.#position = BLOCK_SIZE;
    this.#length = 0;
  }
}
