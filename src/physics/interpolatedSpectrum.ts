import type { Junction } from './barrierProfile.ts';
import { TrapezoidSpectrum } from './trapezoidSpectrum.ts';

/** Chebyshev nodes per side of V = 0 (the exact values are computed there only). */
const NODES_PER_SIDE = 16;
/**
 * Largest |coefficient| allowed among the last three Chebyshev coefficients of ln(J/V) on either
 * side. Where the series has converged this far the interpolation error stays within a few 1e-6
 * relative (measured on barriers of 0.5–15 eV, 2–20 Å, at 0–300 K: 3.6e-6 at worst, where the
 * exact path itself switches between its Sommerfeld and full Fermi branches inside the sweep).
 */
const TAIL_TOLERANCE = 1e-7;
/** The same for the gradient series (∂J/∂p)/J, relative to the size of their leading coefficients. */
const GRADIENT_TAIL_TOLERANCE = 1e-6;

/**
 * The WKB-trapezoid current density over a sweep of many biases, from exact values at a few
 * Chebyshev nodes. Same contract as TrapezoidSpectrum (J in A/m², ∂J/∂(φ1, φ2, d) per eV, eV, m)
 * and the same values to a few 1e-6 relative, for about a fifth of the cost on a 512-point sweep.
 *
 * Method. On each side of V = 0, g(V) = ln(J(V)/V) and h_p(V) = (∂J/∂p)/J are smooth (analytic)
 * while the barrier stays closed, so a Chebyshev interpolant through NODES_PER_SIDE Gauss–Chebyshev
 * nodes converges geometrically. The two sides are kept apart because the free-electron model has
 * a kink at V = 0: the band bottom that limits the energy integral passes from one electrode to the
 * other there (a slope jump of ~1e-3 in ln J for a 0.6 nm, 4 eV barrier). J = V·e^g, ∂J/∂p = J·h_p.
 * Accuracy guard: when the tail of either side's series is above TAIL_TOLERANCE (a barrier low
 * enough for a turning point inside the sweep, the Fowler–Nordheim regime, or a thermal path
 * switching between nodes) that evaluation falls back to the exact sum at every bias.
 * Source: Chebyshev interpolation and its geometric convergence for analytic functions,
 * L. N. Trefethen, Approximation Theory and Approximation Practice (SIAM, 2013), ch. 3, 8 [from memory].
 * @example new InterpolatedTrapezoidSpectrum(biasesV, 300).evaluate(junction, currentDensity, gradient)
 */
export class InterpolatedTrapezoidSpectrum {
  readonly biasesV: Float64Array;
  readonly temperatureK: number;
  #sides: InterpolationSide[];
  /** Per bias: side index (−1 at V = 0) and the Chebyshev polynomials T_0 … T_{m−1} at its mapped x. */
  #sideOf: Int8Array;
  #polynomials: Float64Array;
  /** Sweeps of ≤ 2·NODES_PER_SIDE biases gain nothing: they always take the exact sum. */
  #interpolates: boolean;
  #exact: TrapezoidSpectrum | null = null;
  #fallbacks = 0;
  #evaluations = 0;

  constructor(biasesV: Float64Array, temperatureK: number) {
    this.biasesV = Float64Array.from(biasesV);
    this.temperatureK = temperatureK;
    let low = 0;
    let high = 0;
    for (const v of this.biasesV) {
      if (v < low) low = v;
      if (v > high) high = v;
    }
    this.#sides = [];
    if (low < 0) this.#sides.push(new InterpolationSide(low, 0, temperatureK));
    if (high > 0) this.#sides.push(new InterpolationSide(0, high, temperatureK));
    const m = NODES_PER_SIDE;
    const n = this.biasesV.length;
    this.#interpolates = n > 2 * m;
    this.#sideOf = new Int8Array(n);
    this.#polynomials = new Float64Array(n * m);
    for (let i = 0; i < n; i++) {
      const v = this.biasesV[i];
      const side = v === 0 ? -1 : v < 0 ? 0 : this.#sides.length - 1;
      this.#sideOf[i] = side;
      if (side < 0) continue;
      const x = this.#sides[side].mapped(v);
      const row = i * m;
      this.#polynomials[row] = 1;
      this.#polynomials[row + 1] = x;
      for (let p = 2; p < m; p++) this.#polynomials[row + p] = 2 * x * this.#polynomials[row + p - 1] - this.#polynomials[row + p - 2];
    }
  }

  /** Evaluations so far and how many of them needed the exact sum at every bias. */
  get statistics(): { evaluations: number; fallbacks: number } {
    return { evaluations: this.#evaluations, fallbacks: this.#fallbacks };
  }

  /**
   * Write J_i (A/m²) for every bias into currentDensity, and when given, ∂J_i/∂(φ1, φ2, d) into
   * gradient[3i … 3i + 2] (A/m² per eV, per eV, per m).
   */
  evaluate(junction: Junction, currentDensity: Float64Array, gradient: Float64Array | null): void {
    this.#evaluations++;
    let converged = this.#interpolates;
    for (const side of this.#sides) if (converged) converged = side.fit(junction, gradient !== null);
    if (!converged) {
      if (this.#interpolates) this.#fallbacks++;
      this.#exact ??= new TrapezoidSpectrum(this.biasesV, this.temperatureK);
      this.#exact.evaluate(junction, currentDensity, gradient);
      return;
    }
    const m = NODES_PER_SIDE;
    const polynomials = this.#polynomials;
    for (let i = 0; i < this.biasesV.length; i++) {
      const side = this.#sideOf[i];
      if (side < 0) {
        currentDensity[i] = 0;
        if (gradient !== null) gradient[3 * i] = gradient[3 * i + 1] = gradient[3 * i + 2] = 0;
        continue;
      }
      const c = this.#sides[side].coefficients;
      const row = i * m;
      if (gradient === null) {
        let g = 0;
        for (let p = 0; p < m; p++) g += c[p] * polynomials[row + p];
        currentDensity[i] = this.biasesV[i] * Math.exp(g);
        continue;
      }
      let g = 0;
      let h0 = 0;
      let h1 = 0;
      let h2 = 0;
      for (let p = 0; p < m; p++) {
        const t = polynomials[row + p];
        g += c[p] * t;
        h0 += c[m + p] * t;
        h1 += c[2 * m + p] * t;
        h2 += c[3 * m + p] * t;
      }
      const value = this.biasesV[i] * Math.exp(g);
      currentDensity[i] = value;
      gradient[3 * i] = value * h0;
      gradient[3 * i + 1] = value * h1;
      gradient[3 * i + 2] = value * h2;
    }
  }
}

/** One side of V = 0: its nodes, their exact evaluation, and the Chebyshev coefficients of g, h0, h1, h2. */
class InterpolationSide {
  readonly coefficients = new Float64Array(4 * NODES_PER_SIDE);
  #low: number;
  #high: number;
  #nodes: TrapezoidSpectrum;
  #current = new Float64Array(NODES_PER_SIDE);
  #gradient = new Float64Array(3 * NODES_PER_SIDE);
  #values = new Float64Array(4 * NODES_PER_SIDE);
  /** cos(π p (k + ½)/m), row p. */
  #cosines = new Float64Array(NODES_PER_SIDE * NODES_PER_SIDE);

  constructor(low: number, high: number, temperatureK: number) {
    const m = NODES_PER_SIDE;
    this.#low = low;
    this.#high = high;
    // Gauss–Chebyshev nodes x_k = cos(π(k + ½)/m): never the ends, so never V = 0.
    const nodes = Float64Array.from({ length: m }, (_, k) => 0.5 * (low + high) + 0.5 * (high - low) * Math.cos((Math.PI * (k + 0.5)) / m));
    this.#nodes = new TrapezoidSpectrum(nodes, temperatureK);
    for (let p = 0; p < m; p++) for (let k = 0; k < m; k++) this.#cosines[p * m + k] = Math.cos((Math.PI * p * (k + 0.5)) / m);
  }

  /** x in [−1, 1] of a bias on this side. */
  mapped(biasV: number): number {
    return (2 * biasV - this.#low - this.#high) / (this.#high - this.#low);
  }

  /** Exact values at the nodes, then coefficients; false when the series has not converged. */
  fit(junction: Junction, withGradient: boolean): boolean {
    const m = NODES_PER_SIDE;
    this.#nodes.evaluate(junction, this.#current, withGradient ? this.#gradient : null);
    const biases = this.#nodes.biasesV;
    const values = this.#values;
    for (let k = 0; k < m; k++) {
      const current = this.#current[k];
      if (!(current / biases[k] > 0) || !Number.isFinite(current)) return false;
      values[k] = Math.log(current / biases[k]);
      if (withGradient) for (let q = 0; q < 3; q++) values[(q + 1) * m + k] = this.#gradient[3 * k + q] / current;
    }
    const functions = withGradient ? 4 : 1;
    for (let f = 0; f < functions; f++) {
      for (let p = 0; p < m; p++) {
        let sum = 0;
        for (let k = 0; k < m; k++) sum += values[f * m + k] * this.#cosines[p * m + k];
        this.coefficients[f * m + p] = ((p === 0 ? 1 : 2) / m) * sum;
      }
    }
    if (tailOf(this.coefficients, 0) > TAIL_TOLERANCE) return false;
    for (let f = 1; f < functions; f++) {
      const c = this.coefficients;
      const scale = Math.abs(c[f * m]) + Math.abs(c[f * m + 1]);
      if (tailOf(c, f) > GRADIENT_TAIL_TOLERANCE * scale) return false;
    }
    return true;
  }
}

/** Largest |coefficient| among the last three of series `f` (NODES_PER_SIDE coefficients each). */
function tailOf(coefficients: Float64Array, f: number): number {
  const end = (f + 1) * NODES_PER_SIDE;
  return Math.max(Math.abs(coefficients[end - 1]), Math.abs(coefficients[end - 2]), Math.abs(coefficients[end - 3]));
}
