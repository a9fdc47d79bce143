/**
 * Argument checks shared by the analysis functions (internal; not re-exported from index.ts).
 * Every failure throws `function: argument must be …, got …`.
 */

/**
 * Describe a received value for an error message: numbers as they print, arrays by their length.
 * @example describeValue([1, 2]) // 'an array of length 2'
 */
export function describeValue(value: unknown): string {
  if (typeof value === 'number') return String(value);
  if (value === null || value === undefined) return String(value);
  if (typeof value === 'object' && typeof (value as ArrayLike<unknown>).length === 'number') {
    return `an array of length ${(value as ArrayLike<unknown>).length}`;
  }
  return JSON.stringify(value);
}

/**
 * Check that values is array-like, has at least minimumLength entries, and that every entry is a
 * finite number. Returns a plain copy (never the caller's array).
 * @example requireFiniteArray('robustZScores', 'values', [1, 2], 1) // [1, 2]
 */
export function requireFiniteArray(functionName: string, argumentName: string, values: ArrayLike<number>, minimumLength: number): number[] {
  if (values === null || values === undefined || typeof values !== 'object' || typeof values.length !== 'number') {
    throw new TypeError(`${functionName}: ${argumentName} must be an array of finite numbers, got ${describeValue(values)}`);
  }
  if (values.length < minimumLength) {
    throw new RangeError(
      `${functionName}: ${argumentName} must hold at least ${minimumLength} value${minimumLength === 1 ? '' : 's'}, got ${values.length}`,
    );
  }
  const copy = new Array<number>(values.length);
  for (let i = 0; i < values.length; i++) {
    const value = values[i];
    if (typeof value !== 'number' || !Number.isFinite(value)) {
      throw new RangeError(`${functionName}: ${argumentName}[${i}] must be a finite number, got ${describeValue(value)}`);
    }
    copy[i] = value;
  }
  return copy;
}

/**
 * Check that two arrays have the same length.
 * @example requireSameLength('qualityMetrics', 'fitted', 3, 3) // no error
 */
export function requireSameLength(functionName: string, argumentName: string, length: number, expectedLength: number): void {
  if (length !== expectedLength) {
    throw new RangeError(`${functionName}: ${argumentName} must have length ${expectedLength} (one per point), got ${length}`);
  }
}

/**
 * Check that a number is finite and strictly positive.
 * @example requirePositive('detectStepChange', 'sigma', 0.1) // no error
 */
export function requirePositive(functionName: string, argumentName: string, value: number): void {
  if (typeof value !== 'number' || !(value > 0) || !Number.isFinite(value)) {
    throw new RangeError(`${functionName}: ${argumentName} must be a finite number > 0, got ${describeValue(value)}`);
  }
}
