/**
 * Quantiles of the Student t and standard normal distributions, for confidence intervals.
 * simple-statistics has the normal quantile only as `probit`, an approximation good to about 2e-3
 * (probit(0.975) = 1.9572 against 1.95996), and no t quantile; both are found here by bisection
 * on the accurate tail probabilities of tailProbabilities.ts, which is slow (≈ 100 evaluations)
 * but exact to the last few bits and simple to check.
 * Source: the tail probabilities as in tailProbabilities.ts (Numerical Recipes 3rd ed. §6.4, §6.14);
 * bisection, any numerical-analysis text (common practice, no source).
 */
import { normalLowerTailProbability, studentTTwoSidedPValue } from './tailProbabilities.ts';
import { describeValue } from './validate.ts';

const BISECTION_STEPS = 200;

function requireProbability(functionName: string, probability: number): void {
  if (typeof probability !== 'number' || !(probability > 0 && probability < 1)) {
    throw new RangeError(`${functionName}: probability must be within (0, 1), got ${describeValue(probability)}`);
  }
}

/**
 * Lower-tail probability of Student's t with ν degrees of freedom: P(T_ν ≤ t).
 * Formula: F(t) = 1 − ½ I_{ν/(ν+t²)}(ν/2, ½) for t ≥ 0, ½ I_{ν/(ν+t²)}(ν/2, ½) for t < 0.
 * t dimensionless, ν > 0 (need not be an integer: Welch's ν is not).
 * Source: A&S 26.7.1 with 26.5.27 [from memory]; Numerical Recipes 3rd ed. §6.14.
 * @example studentTLowerTailProbability(2.228138851986, 10) // ≈ 0.975
 */
export function studentTLowerTailProbability(t: number, degreesOfFreedom: number): number {
  if (typeof t !== 'number' || Number.isNaN(t)) throw new RangeError(`studentTLowerTailProbability: t must be a number, got ${describeValue(t)}`);
  if (!(degreesOfFreedom > 0) || !Number.isFinite(degreesOfFreedom)) {
    throw new RangeError(`studentTLowerTailProbability: degreesOfFreedom must be a finite number > 0, got ${describeValue(degreesOfFreedom)}`);
  }
  const twoSided = studentTTwoSidedPValue(t, degreesOfFreedom);
  return t >= 0 ? 1 - twoSided / 2 : twoSided / 2;
}

/**
 * Quantile of Student's t with ν degrees of freedom: the t with P(T_ν ≤ t) = probability.
 * Solved by bisection on |t| against the two-sided tail 2·min(p, 1 − p) = I_{ν/(ν+t²)}(ν/2, ½),
 * which keeps full relative accuracy deep in either tail. Probability in (0, 1), ν > 0 (any real).
 * Source: as studentTLowerTailProbability; checked against scipy.stats.t.ppf.
 * @example studentTQuantile(0.975, 10) // 2.22813885198627
 */
export function studentTQuantile(probability: number, degreesOfFreedom: number): number {
  const name = 'studentTQuantile';
  requireProbability(name, probability);
  if (!(degreesOfFreedom > 0) || !Number.isFinite(degreesOfFreedom)) {
    throw new RangeError(`${name}: degreesOfFreedom must be a finite number > 0, got ${describeValue(degreesOfFreedom)}`);
  }
  if (probability === 0.5) return 0;
  const tail = 2 * Math.min(probability, 1 - probability);
  // studentTTwoSidedPValue falls from 1 at t = 0 towards 0: grow the bracket until it is below the tail.
  let low = 0;
  let high = 1;
  while (studentTTwoSidedPValue(high, degreesOfFreedom) > tail) {
    low = high;
    high *= 2;
    if (high > 1e300) break;
  }
  for (let step = 0; step < BISECTION_STEPS; step++) {
    const middle = 0.5 * (low + high);
    if (middle === low || middle === high) break;
    if (studentTTwoSidedPValue(middle, degreesOfFreedom) > tail) low = middle;
    else high = middle;
  }
  const magnitude = 0.5 * (low + high);
  return probability > 0.5 ? magnitude : -magnitude;
}

/**
 * Quantile of the standard normal distribution (Φ⁻¹, the probit): the z with Φ(z) = probability.
 * Bisection on Φ from normalLowerTailProbability (an incomplete-gamma erfc, accurate in both tails).
 * Probability in (0, 1); dimensionless.
 * Source: A&S 26.2.29 [from memory] for Φ; checked against scipy.stats.norm.ppf.
 * @example normalQuantile(0.975) // 1.95996398454005
 */
export function normalQuantile(probability: number): number {
  requireProbability('normalQuantile', probability);
  if (probability === 0.5) return 0;
  // Work in the lower tail, where Φ has full relative accuracy, and mirror.
  const tail = Math.min(probability, 1 - probability);
  let low = -40;
  let high = 0;
  for (let step = 0; step < BISECTION_STEPS; step++) {
    const middle = 0.5 * (low + high);
    if (middle === low || middle === high) break;
    if (normalLowerTailProbability(middle) < tail) low = middle;
    else high = middle;
  }
  const lowerTailZ = 0.5 * (low + high);
  return probability < 0.5 ? lowerTailZ : -lowerTailZ;
}
