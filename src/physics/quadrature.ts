/**
 * Gauss quadrature rules, computed once by Newton iteration on the three-term recurrences.
 * Source: M. Abramowitz and I. A. Stegun, Handbook of Mathematical Functions (1964), §25.4.29
 * (Gauss–Legendre) and §25.4.45 (Gauss–Laguerre); tabulated nodes in Tables 25.4 and 25.9.
 */

export interface QuadratureRule {
  nodes: Float64Array;
  weights: Float64Array;
}

const legendreCache = new Map<number, QuadratureRule>();
const laguerreCache = new Map<number, QuadratureRule>();

/**
 * n-point Gauss–Legendre rule on [−1, 1]: ∫f ≈ Σ w_i f(x_i), exact for polynomials of degree 2n − 1.
 * @example gaussLegendre(2).nodes // [−0.5773502691896257, 0.5773502691896257]
 */
export function gaussLegendre(n: number): QuadratureRule {
  if (!(Number.isInteger(n) && n >= 1 && n <= 200)) throw new Error(`gaussLegendre: n must be an integer in [1, 200], got ${n}`);
  const cached = legendreCache.get(n);
  if (cached) return cached;
  const nodes = new Float64Array(n);
  const weights = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let x = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let derivative = 0;
    for (let iteration = 0; iteration < 100; iteration++) {
      let p0 = 1;
      let p1 = x;
      for (let k = 2; k <= n; k++) {
        const p2 = ((2 * k - 1) * x * p1 - (k - 1) * p0) / k;
        p0 = p1;
        p1 = p2;
      }
      if (n === 1) p0 = 1;
      derivative = (n * (x * p1 - p0)) / (x * x - 1);
      const step = p1 / derivative;
      x -= step;
      if (Math.abs(step) < 1e-16) break;
    }
    nodes[n - 1 - i] = x;
    weights[n - 1 - i] = 2 / ((1 - x * x) * derivative * derivative);
  }
  const rule = { nodes, weights };
  legendreCache.set(n, rule);
  return rule;
}

/**
 * n-point Gauss–Laguerre rule: ∫_0^∞ e^{−x} f(x) dx ≈ Σ w_i f(x_i).
 * @example gaussLaguerre(2).nodes // [2 − √2, 2 + √2]
 */
export function gaussLaguerre(n: number): QuadratureRule {
  if (!(Number.isInteger(n) && n >= 1 && n <= 60)) throw new Error(`gaussLaguerre: n must be an integer in [1, 60], got ${n}`);
  const cached = laguerreCache.get(n);
  if (cached) return cached;
  const nodes = new Float64Array(n);
  const weights = new Float64Array(n);
  let x = 0;
  for (let i = 0; i < n; i++) {
    // Initial guesses as in Numerical Recipes §4.5 (gaulag), then Newton on L_n.
    if (i === 0) x = 3 / (1 + 2.4 * n);
    else if (i === 1) x += 15 / (1 + 2.5 * n);
    else x += ((1 + 2.55 * (i - 1)) / (1.9 * (i - 1))) * (x - nodes[i - 2]);
    let derivative = 0;
    for (let iteration = 0; iteration < 200; iteration++) {
      let p0 = 1;
      let p1 = 1 - x;
      for (let k = 2; k <= n; k++) {
        const p2 = ((2 * k - 1 - x) * p1 - (k - 1) * p0) / k;
        p0 = p1;
        p1 = p2;
      }
      if (n === 1) p0 = 1;
      derivative = (n * (p1 - p0)) / x;
      const step = p1 / derivative;
      x -= step;
      if (Math.abs(step) < 1e-15 * Math.max(1, x)) break;
    }
    nodes[i] = x;
    // w_i = 1 / (x_i L_n'(x_i)²)
    weights[i] = 1 / (x * derivative * derivative);
  }
  const rule = { nodes, weights };
  laguerreCache.set(n, rule);
  return rule;
}
