/**
 * Fit parameters as plain data. A parameter is `{ name, value, initValue, min, max, vary }`; a fit
 * returns the same fields plus `stderr`, `atBound` and `correlations`. Values carry whatever unit
 * the model gives them (name them with the unit, e.g. `barrierHeightEV`).
 */
import type { BoundSide } from './solver.ts';

/** A model parameter: current value, start value, box [min, max] and whether the fit may vary it. */
export interface Parameter {
  readonly name: string;
  readonly value: number;
  readonly initValue: number;
  readonly min: number;
  readonly max: number;
  readonly vary: boolean;
}

/** What {@link makeParameter} accepts: name and value are required; min/max default to ∓Infinity. */
export interface ParameterInput {
  name: string;
  value: number;
  min?: number;
  max?: number;
  vary?: boolean;
  /** Start value remembered for reports; defaults to value. */
  initValue?: number;
}

/**
 * A parameter after a fit. stderr is in the parameter's unit (NaN when fixed or not available);
 * correlations maps each other free parameter's name to the correlation coefficient r (−1 … 1).
 */
export interface FittedParameter extends Parameter {
  readonly stderr: number;
  readonly atBound: BoundSide;
  readonly correlations: Readonly<Record<string, number>>;
}

/**
 * Create a validated parameter. Checks: name non-empty, value finite, min < max, min ≤ value ≤ max,
 * initValue finite. Defaults: min −Infinity, max +Infinity, vary true, initValue = value.
 * Source: lmfit's Parameter (M. Newville et al., lmfit documentation; from memory) for the shape.
 * @example makeParameter({ name: 'decayPerNm', value: 10, min: 0 })
 * // { name: 'decayPerNm', value: 10, initValue: 10, min: 0, max: Infinity, vary: true }
 */
export function makeParameter(input: ParameterInput): Parameter {
  const { name, value } = input;
  const min = input.min ?? -Infinity;
  const max = input.max ?? Infinity;
  const vary = input.vary ?? true;
  const initValue = input.initValue ?? value;
  if (typeof name !== 'string' || name.length === 0) {
    throw new TypeError(`makeParameter: name must be a non-empty string, got ${JSON.stringify(name)}`);
  }
  if (!Number.isFinite(value)) {
    throw new RangeError(`makeParameter: value of ${name} must be finite, got ${value}`);
  }
  if (Number.isNaN(min) || Number.isNaN(max) || !(min < max)) {
    throw new RangeError(`makeParameter: min must be < max, got min ${min}, max ${max}`);
  }
  if (value < min || value > max) {
    throw new RangeError(`makeParameter: value of ${name} must be within [${min}, ${max}], got ${value}`);
  }
  if (!Number.isFinite(initValue)) {
    throw new RangeError(`makeParameter: initValue of ${name} must be finite, got ${initValue}`);
  }
  if (typeof vary !== 'boolean') {
    throw new TypeError(`makeParameter: vary of ${name} must be a boolean, got ${JSON.stringify(vary)}`);
  }
  return { name, value, initValue, min, max, vary };
}

/**
 * Create several parameters at once, checking each and that names are unique.
 * Source: none needed (validation helper).
 * @example makeParameters([{ name: 'a', value: 1 }, { name: 'k', value: 2, vary: false }]).length // 2
 */
export function makeParameters(inputs: readonly ParameterInput[]): Parameter[] {
  const seen = new Set<string>();
  const parameters: Parameter[] = [];
  for (const input of inputs) {
    const parameter = makeParameter(input);
    if (seen.has(parameter.name)) {
      throw new RangeError(`makeParameters: names must be unique, got ${parameter.name} twice`);
    }
    seen.add(parameter.name);
    parameters.push(parameter);
  }
  return parameters;
}

/**
 * A copy of a parameter with some fields changed, validated again (parameters are never mutated).
 * Source: none needed.
 * @example withParameter(makeParameter({ name: 'a', value: 1 }), { vary: false }).vary // false
 */
export function withParameter(parameter: Parameter, changes: Partial<ParameterInput>): Parameter {
  return makeParameter({ ...parameter, ...changes });
}
