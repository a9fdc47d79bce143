import { describe, expect, it } from 'vitest';
import {
  apparentBarrierErrorEV,
  apparentBarrierFromSlopeEV,
  gapToContactM,
  logCurrentSlopeForBarrierPerM,
  prefactorApparentBarrierEV,
  prefactorCorrectedBarrierEV,
  trapezoidCurrentDensity,
} from '../../src/physics/index.ts';
import { expectRelClose } from '../helpers.ts';

const angstrom = 1e-10;

describe('apparent barrier height', () => {
  it('apparentBarrierFromSlopeEV reproduces the physics.md §2 checks', () => {
    // physics.md §2: slope −2.0 Å⁻¹ → 3.8100 eV (ħ²/8m_e = 0.95249553 eV Å², CODATA 2022)
    expectRelClose(apparentBarrierFromSlopeEV(-2 / angstrom), 3.8099821, 1e-7);
    // physics.md §2: one decade per Å → 5.0500 eV
    expectRelClose(apparentBarrierFromSlopeEV(-Math.LN10 / angstrom), 5.05, 1e-4);
  });

  it('logCurrentSlopeForBarrierPerM inverts it: φ = 4 eV decays ×7.7622 per Å', () => {
    // physics.md §2: φ = 4 eV → κ = 1.02463 Å⁻¹, ×7.7622 per Å, a decade per 1.1236 Å
    const slope = logCurrentSlopeForBarrierPerM(4);
    expectRelClose(Math.exp(-slope * angstrom), 7.7622, 1e-4);
    expectRelClose(Math.LN10 / -slope / angstrom, 1.1236, 1e-4);
    expectRelClose(apparentBarrierFromSlopeEV(slope), 4, 1e-12);
  });

  it('apparentBarrierErrorEV follows σ_φ/φ = 2σ_slope/|slope|', () => {
    // physics.md §2: σ_φ/φ = 2σ_slope/|slope| (first-order error propagation)
    expectRelClose(apparentBarrierErrorEV(-2e10, 1e8) / apparentBarrierFromSlopeEV(-2e10), 0.01, 1e-12);
  });

  it('the planar-WKB prefactor raises φ_ap at small gaps as physics.md §2 states', () => {
    // physics.md §2 (full T = 0 integral, φ = 4, E_F = 5.5, V = 0.1 V): φ_ap = 4.8654 / 4.6114 / 4.4166 / 4.1980 eV at s = 5 / 7 / 10 / 20 Å
    const expected: [number, number][] = [[5, 4.8654], [7, 4.6114], [10, 4.4166], [20, 4.198]];
    for (const [s, phiAp] of expected) {
      const h = 0.001 * angstrom;
      const j = (gap: number) => trapezoidCurrentDensity({ tipWorkFunctionEV: 4, sampleWorkFunctionEV: 4, gapM: gap, fermiEnergyEV: 5.5 }, 0.1, 0);
      const slope = (Math.log(j(s * angstrom + h)) - Math.log(j(s * angstrom - h))) / (2 * h);
      expectRelClose(apparentBarrierFromSlopeEV(slope), phiAp, 2e-4);
    }
    // the closed-form (1.0246√φ + 1/s)² estimate is within 1 % of it at 10 Å
    expectRelClose(prefactorApparentBarrierEV(4, 10 * angstrom), 4.4166, 0.01);
    expectRelClose(prefactorCorrectedBarrierEV(-Math.sqrt(4.4166 / 0.95249553) / angstrom, 10 * angstrom), 4, 0.01);
  });
});

describe('gapToContactM', () => {
  it('reproduces the physics.md §3 checks', () => {
    // physics.md §3: φ_ap = 4 eV, 1 nA at 0.1 V → 4.3700 Å (6.1800 Å if φ_ap = 2)
    expectRelClose(gapToContactM({ currentA: 1e-9, biasV: 0.1, apparentBarrierEV: 4 }).gapM / angstrom, 4.37, 1e-4);
    expectRelClose(gapToContactM({ currentA: 1e-9, biasV: 0.1, apparentBarrierEV: 2 }).gapM / angstrom, 6.18, 1e-4);
    // physics.md §3: 100 pA at 1 V → 6.6172 Å; 1 nA at 1 V → 5.4936 Å
    expectRelClose(gapToContactM({ currentA: 1e-10, biasV: 1, apparentBarrierEV: 4 }).gapM / angstrom, 6.6172, 1e-4);
    expectRelClose(gapToContactM({ currentA: 1e-9, biasV: 1, apparentBarrierEV: 4 }).gapM / angstrom, 5.4936, 1e-4);
    // physics.md §3: σ_φ = 0.4 eV → σ_z = 0.2185 Å
    const withError = gapToContactM({ currentA: 1e-9, biasV: 0.1, apparentBarrierEV: 4, apparentBarrierErrorEV: 0.4 });
    expectRelClose(withError.gapErrorM / angstrom, 0.2185, 1e-3);
  });

  it('rejects a zero bias with a located message', () => {
    expect(() => gapToContactM({ currentA: 1e-9, biasV: 0, apparentBarrierEV: 4 })).toThrow('gapToContactM: biasV must be non-zero, got 0');
  });
});
