import { describe, expect, it } from 'vitest';
import {
  FOWLER_NORDHEIM_A_A_EV_PER_V2,
  FOWLER_NORDHEIM_B_PER_EV_1_5_V_PER_M,
  SCHOTTKY_CONSTANT_SQUARED_EV2_M_PER_V,
  ellipticE,
  ellipticK,
  exactBarrierFunctions,
  forbesBarrierFunctions,
  fowlerNordheimElementary,
  fowlerNordheimPlotSlope,
  fowlerNordheimSchottkyNordheim,
  scaledBarrierField,
} from '../../src/physics/fowlerNordheim.ts';
import { expectRelClose } from '../helpers.ts';

/** |actual − printed| ≤ half a unit in the last printed digit. */
function expectPrinted(actual: number, printed: number, lastDigit: number): void {
  expect(Math.abs(actual - printed), `${actual} printed as ${printed}`).toBeLessThanOrEqual(lastDigit / 2);
}

const example = { workFunctionEV: 4.5, fieldVPerM: 5e9 };

describe('Fowler–Nordheim constants', () => {
  it('FN constants a, b and c_S² equal the physics.md §8 values', () => {
    // physics.md §8 (Forbes; exact in the 2019 SI): a = e³/(8πh) = 1.541433873e-6 A eV V⁻²
    expectRelClose(FOWLER_NORDHEIM_A_A_EV_PER_V2, 1.541433873e-6, 1e-9);
    // physics.md §8: b = 6.8308896 eV^{−3/2} V nm⁻¹
    expectRelClose(FOWLER_NORDHEIM_B_PER_EV_1_5_V_PER_M * 1e-9, 6.8308896, 1e-7);
    // physics.md §8: c_S² = 1.4399645 eV² V⁻¹ nm
    expectRelClose(SCHOTTKY_CONSTANT_SQUARED_EV2_M_PER_V * 1e9, 1.4399645, 1e-7);
  });
});

describe('barrier functions', () => {
  it('forbesBarrierFunctions reproduces the physics.md §8 example (φ = 4.5 eV, F = 5 V/nm)', () => {
    const f = scaledBarrierField(example);
    // Forbes, Appl. Phys. Lett. 89, 113122 (2006) (citation from memory), example confirmed in physics.md §8
    expectPrinted(f, 0.35555, 1e-5);
    const { v, t, s } = forbesBarrierFunctions(f);
    expectPrinted(v, 0.58317, 1e-5);
    expectPrinted(t, 1.05993, 1e-5);
    // physics.md §8: FN-plot slope correction s_t ≈ 1 − f/6 = 0.94074
    expectPrinted(s, 0.94074, 1e-5);
    expect(forbesBarrierFunctions(0)).toEqual({ v: 1, t: 1, s: 1 });
  });

  it('ellipticK and ellipticE equal scipy.special.ellipk / ellipe', () => {
    // Reference: scipy 1.17 scipy.special.ellipk(m), ellipe(m), printed with repr()
    const scipy: Array<[number, number, number]> = [
      [0, 1.5707963267948966, 1.5707963267948966],
      [0.1, 1.6124413487202192, 1.5307576368977633],
      [0.3, 1.713889448178791, 1.4453630644126654],
      [0.5, 1.8540746773013719, 1.3506438810476755],
      [0.7, 2.075363135292469, 1.2416705679458229],
      [0.9, 2.5780921133481733, 1.1047747327040733],
      [0.99, 3.6956373629898747, 1.015993545025224],
      [0.999999, 8.294051463601061, 1.0000038970261722],
    ];
    for (const [m, k, e] of scipy) {
      expectRelClose(ellipticK(m), k, 1e-14);
      expectRelClose(ellipticE(m), e, 1e-14);
    }
    expect(ellipticK(1)).toBe(Infinity);
    expect(ellipticE(1)).toBe(1);
    expect(() => ellipticK(-0.1)).toThrow('ellipticK: m must be in [0, 1], got -0.1');
  });

  it('exactBarrierFunctions equals the elliptic-integral form evaluated with scipy', () => {
    // physics.md §8: exact v = √(1+y)[E(m) − yK(m)] at f = 0.35555 is 0.58127 (scipy ellipe/ellipk)
    expectPrinted(exactBarrierFunctions(0.35555).v, 0.58127, 1e-5);
    // Reference: the same v and t = [(1+y)E(m) − yK(m)]/√(1+y) (Forbes & Deane, Proc. R. Soc. A 463, 2907 (2007),
    // from memory) evaluated with scipy.special.ellipk/ellipe at f = 0.1, 0.5, 0.8, 1
    const scipy: Array<[number, number, number]> = [
      [0.1, 0.859438904600344, 1.0225175695043711],
      [0.5, 0.4409499417406208, 1.0706817034430343],
      [0.8, 0.16998660050891143, 1.096121661338738],
      [1, 0, 1.1107207345395915],
    ];
    for (const [f, v, t] of scipy) {
      const exact = exactBarrierFunctions(f);
      if (v === 0) expect(Math.abs(exact.v)).toBeLessThan(1e-15);
      else expectRelClose(exact.v, v, 1e-13);
      expectRelClose(exact.t, t, 1e-13);
    }
  });

  it('exactBarrierFunctions satisfies t = v − (4/3)f·dv/df and s = v − f·dv/df', () => {
    // Defining relations of t and s (Forbes & Deane 2007, from memory), checked with central differences of v
    for (const f of [0.05, 0.2, 0.35555, 0.6, 0.9]) {
      const h = 1e-6;
      const slope = (exactBarrierFunctions(f + h).v - exactBarrierFunctions(f - h).v) / (2 * h);
      const { v, t, s } = exactBarrierFunctions(f);
      expectRelClose(t, v - (4 / 3) * f * slope, 1e-8);
      expectRelClose(s, v - f * slope, 1e-8);
    }
  });

  it('forbesBarrierFunctions is within 0.33 % of exact v for f = 0.1–0.8', () => {
    // physics.md §8: the approximation is within 0.33 % (printed to 2 digits, so < 0.335 %) for f = 0.1–0.8;
    // the largest deviation, 0.3318 %, is near f = 0.296
    for (let f = 0.1; f <= 0.8 + 1e-12; f += 0.01) {
      const approx = forbesBarrierFunctions(f).v;
      const exact = exactBarrierFunctions(f).v;
      expect(Math.abs(approx / exact - 1)).toBeLessThan(0.00335);
    }
  });
});

describe('Fowler–Nordheim current density', () => {
  it('fowlerNordheimElementary and fowlerNordheimSchottkyNordheim reproduce the physics.md §8 currents', () => {
    // physics.md §8: φ = 4.5 eV, F = 5 V/nm → 1.85704e7 A/m² (elementary FN)
    expectPrinted(fowlerNordheimElementary(example), 1.85704e7, 100);
    // physics.md §8: Schottky–Nordheim with Forbes' v, t → 3.79396e9 A/m²
    expectPrinted(fowlerNordheimSchottkyNordheim(example), 3.79396e9, 1e4);
    // SN with exact v, t: the same formula, exp(−v b φ^{3/2}/F) a/(t²φ) F² (Forbes 2006 form, physics.md §8)
    const { v, t } = exactBarrierFunctions(scaledBarrierField(example));
    const expected = (FOWLER_NORDHEIM_A_A_EV_PER_V2 / (t * t * 4.5)) * 25e18 * Math.exp((-v * FOWLER_NORDHEIM_B_PER_EV_1_5_V_PER_M * 4.5 ** 1.5) / 5e9);
    expectRelClose(fowlerNordheimSchottkyNordheim({ ...example, barrierFunctions: 'exact' }), expected, 1e-7);
    expect(() => fowlerNordheimSchottkyNordheim({ workFunctionEV: 2, fieldVPerM: 5e9 })).toThrow('must be <= 1');
  });

  it('fowlerNordheimPlotSlope equals −s_t·b·φ^{3/2}·d', () => {
    const bPhi = FOWLER_NORDHEIM_B_PER_EV_1_5_V_PER_M * 4.5 ** 1.5 * 1e-9;
    // physics.md §8: slope −s_t b φ^{3/2} d with s_t ≈ 1 − f/6 = 0.94074 at φ = 4.5, F = 5 V/nm (d = 1 nm, V = 5 V)
    expectPrinted(fowlerNordheimPlotSlope({ workFunctionEV: 4.5, gapM: 1e-9, biasV: 5 }) / -bPhi, 0.94074, 1e-5);
    // Elementary FN: s = 1 (physics.md §8)
    expectRelClose(fowlerNordheimPlotSlope({ workFunctionEV: 4.5, gapM: 1e-9, biasV: 5, barrier: 'elementary' }), -bPhi, 1e-15);
    // Exact s = v − f·dv/df makes −s·bφ^{3/2}d the slope of the exponent −v(f)·bφ^{3/2}d/V against 1/V
    // (Forbes 2006, from memory): checked by a central difference in 1/V at V = 5 V
    const exponent = (inverseBias: number): number => {
      const f = scaledBarrierField({ workFunctionEV: 4.5, fieldVPerM: 1 / inverseBias / 1e-9 });
      return -exactBarrierFunctions(f).v * bPhi * inverseBias;
    };
    const h = 1e-6;
    const numeric = (exponent(0.2 + h) - exponent(0.2 - h)) / (2 * h);
    expectRelClose(fowlerNordheimPlotSlope({ workFunctionEV: 4.5, gapM: 1e-9, biasV: 5, barrier: 'exact' }), numeric, 1e-7);
  });
});
