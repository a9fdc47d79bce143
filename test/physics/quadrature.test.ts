import { describe, expect, it } from 'vitest';
import { gaussLaguerre, gaussLegendre } from '../../src/physics/index.ts';
import { expectRelClose } from '../helpers.ts';

describe('quadrature rules', () => {
  it('gaussLegendre(6) has the tabulated nodes and weights', () => {
    // Abramowitz & Stegun Table 25.4, n = 6: ±0.932469514203152, weight 0.171324492379170
    expectRelClose(gaussLegendre(6).nodes[5], 0.932469514203152, 1e-14);
    expectRelClose(gaussLegendre(6).weights[5], 0.17132449237917, 1e-13);
  });

  it('gaussLegendre(n) integrates degree 2n − 1 exactly', () => {
    const rule = gaussLegendre(5);
    let sum = 0;
    for (let i = 0; i < 5; i++) sum += rule.weights[i] * rule.nodes[i] ** 8;
    // ∫_{−1}^{1} x⁸ dx = 2/9 (exact, textbook)
    expectRelClose(sum, 2 / 9, 1e-14);
  });

  it('gaussLaguerre(6) matches the tabulated rule and integrates x⁵e^{−x} to 5!', () => {
    // Abramowitz & Stegun Table 25.9, n = 6: first node 0.222846604179, weight 0.458964673950
    expectRelClose(gaussLaguerre(6).nodes[0], 0.222846604179, 1e-11);
    expectRelClose(gaussLaguerre(6).weights[0], 0.45896467395, 1e-11);
    const rule = gaussLaguerre(6);
    let sum = 0;
    for (let i = 0; i < 6; i++) sum += rule.weights[i] * rule.nodes[i] ** 5;
    // ∫_0^∞ x⁵ e^{−x} dx = Γ(6) = 120 (exact)
    expectRelClose(sum, 120, 1e-12);
  });

  it('rejects a bad order with a located message', () => {
    expect(() => gaussLegendre(0)).toThrow('gaussLegendre: n must be an integer in [1, 200], got 0');
  });
});
