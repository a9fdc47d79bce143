/**
 * Storage for one numeric column while a file streams in: SI values in one contiguous Float64Array,
 * so a curve that spans a whole column can be a view of it instead of a copy. A column that holds a
 * single repeated value (a fixed bias) keeps just that value until another one arrives.
 * Capacity comes from an estimate of the row count when the file size is known (usually no copy);
 * past the estimate it grows by a quarter, without one by half (one copy of the column per growth).
 */
export class ColumnValues {
  #values: Float64Array | null = null;
  #length = 0;
  #capacity: number;
  #growth: number;
  /** While #values is null, every value so far equals #constant (NaN counts as equal to NaN). */
  #constant = 0;

  /** @param expectedRows estimate of the number of rows (0 when unknown) */
  constructor(expectedRows: number) {
    this.#capacity = Math.max(1024, Math.ceil(expectedRows));
    this.#growth = expectedRows > 1024 ? 1.25 : 1.5;
  }

  /** Number of values pushed. */
  get length(): number {
    return this.#length;
  }

  /** Append one value (NaN for a missing or bad cell). */
  push(value: number): void {
    const values = this.#values;
    if (values === null) {
      if (this.#length === 0) this.#constant = value;
      else if (value !== this.#constant && !(value !== value && this.#constant !== this.#constant)) {
        this.#materialise();
        this.push(value);
        return;
      }
      this.#length++;
      return;
    }
    if (this.#length === values.length) this.#grow();
    this.#values![this.#length++] = value;
  }

  #materialise(): void {
    const values = new Float64Array(Math.max(this.#capacity, this.#length + 1));
    values.fill(this.#constant, 0, this.#length);
    this.#values = values;
  }

  #grow(): void {
    const grown = new Float64Array(Math.ceil(this.#values!.length * this.#growth) + 1024);
    grown.set(this.#values!);
    this.#values = grown;
  }

  /** Value at a 0-based row (< length). */
  get(index: number): number {
    return this.#values === null ? this.#constant : this.#values[index];
  }

  /** A view of rows [start, end) sharing this column's memory, or null for a constant column. */
  view(start: number, end: number): Float64Array | null {
    return this.#values === null ? null : this.#values.subarray(start, end);
  }
}

/**
 * 1-based file line of each stored row, kept as the few places where rows skip lines
 * (blank, comment or rejected lines) rather than one number per row.
 * @example const m = new LineMap(); m.record(0, 5); m.record(1, 6); m.record(2, 9); m.lineOf(2) // 9
 */
export class LineMap {
  #rows: number[] = [];
  #lines: number[] = [];
  #next = -1;
  #count = 0;

  /** Note that stored row `row` (the next one, counting from 0) came from file line `line`. */
  record(row: number, line: number): void {
    if (line !== this.#next || this.#rows.length === 0) {
      this.#rows.push(row);
      this.#lines.push(line);
    }
    this.#next = line + 1;
    this.#count = row + 1;
  }

  /** Number of rows recorded. */
  get length(): number {
    return this.#count;
  }

  /** File line of a stored row (the last row's line for indices past the end; 1 when empty). */
  lineOf(row: number): number {
    if (this.#rows.length === 0) return 1;
    const r = Math.min(row, this.#count - 1);
    let lo = 0;
    let hi = this.#rows.length - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >> 1;
      if (this.#rows[mid] <= r) lo = mid;
      else hi = mid - 1;
    }
    return this.#lines[lo] + (r - this.#rows[lo]);
  }
}
