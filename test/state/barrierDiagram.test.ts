import { describe, expect, it } from 'vitest';
import type { CurveResult } from '../../src/analysis/index.ts';
import { DEFAULT_SETTINGS } from '../../src/fit/index.ts';
import { barrierDiagram, diagramJunction, wkbDeviation } from '../../src/state/barrierDiagram.ts';
import { expectRelClose } from '../helpers.ts';

function result(overrides: Partial<CurveResult>): CurveResult {
  return {
    file: 'a.csv', curve: 'a.csv#0/single', index: 0, segment: 'single', kind: 'iz', model: 'iz-exponential', status: 'ok', message: '', run: 'r',
    apparentBarrierEV: null, apparentBarrierErrEV: null, prefactorCorrectedBarrierEV: null, decayPerNm: null, decayErrPerNm: null,
    gapToContactNm: null, gapToContactErrNm: null, phi1EV: null, phi1ErrEV: null, phi2EV: null, phi2ErrEV: null, meanBarrierEV: null,
    meanBarrierErrEV: null, asymmetryEV: null, asymmetryErrEV: null, widthNm: null, widthErrNm: null, areaNm2: null, areaErrNm2: null,
    quality: { r2: 1, reducedChi2: 1, durbinWatson: 2, rmsResidual: 0, pointsUsed: 10, points: 10 },
    flags: [], position: null, line: null, spectrum: null, conditions: { biasV: 0.1, temperatureK: 300 },
    ...overrides,
  };
}

describe('state/barrierDiagram', () => {
  it('diagramJunction(I(V)) takes φ1, φ2 and the width as fitted', () => {
    const junction = diagramJunction(result({ kind: 'iv', model: 'wkb', phi1EV: 4.5, phi2EV: 5.1, widthNm: 0.6 }), { ...DEFAULT_SETTINGS }, [-1, 1]);
    expect(junction?.junction).toEqual({ tipWorkFunctionEV: 4.5, sampleWorkFunctionEV: 5.1, gapM: 0.6e-9, fermiEnergyEV: 5.5 });
    expect(junction?.biasRangeV).toEqual([-1, 1]);
  });

  it('diagramJunction(I(z)) keeps the mean barrier at φ_ap and uses the tip work function setting for φ1', () => {
    const izResult = result({ apparentBarrierEV: 4.4, gapToContactNm: 0.5 });
    const symmetric = diagramJunction(izResult, { ...DEFAULT_SETTINGS })!;
    expect(symmetric.junction.tipWorkFunctionEV).toBe(4.4);
    expect(symmetric.junction.sampleWorkFunctionEV).toBe(4.4);
    expect(symmetric.biasV).toBe(0.1);
    const withTip = diagramJunction(izResult, { ...DEFAULT_SETTINGS, tipWorkFunctionEV: 4.0 })!;
    expect(withTip.junction.tipWorkFunctionEV).toBe(4.0);
    expect(withTip.junction.sampleWorkFunctionEV).toBeCloseTo(4.8, 12);
    expect(diagramJunction(result({ status: 'failed' }), { ...DEFAULT_SETTINGS })).toBeNull();
  });

  it('barrierDiagram draws the trapezoid φ1 → φ2 − eV and the window between the Fermi levels', () => {
    // Simmons, J. Appl. Phys. 34, 2581 (1963): U(0) = φ1, U(d) = φ2 − eV above the tip Fermi level.
    const junction = { tipWorkFunctionEV: 4, sampleWorkFunctionEV: 4.6, gapM: 1e-9, fermiEnergyEV: 5.5 };
    const diagram = barrierDiagram(junction, 0.5, 300, false);
    expect(diagram.trapezoid.energyEV[0]).toBeCloseTo(4, 12);
    expect(diagram.trapezoid.energyEV[1]).toBeCloseTo(4.1, 12);
    expect(diagram.sampleFermiEV).toBe(-0.5);
    expect(diagram.window.lowEV).toBe(-0.5);
    expect(diagram.window.highEV).toBe(0);
    expect(diagram.imageRounded).toBeNull();
    const negative = barrierDiagram(junction, -0.5, 300, false);
    expect([negative.window.lowEV, negative.window.highEV]).toEqual([0, 0.5]);
  });

  it('barrierDiagram adds the image-rounded barrier below the trapezoid when asked', () => {
    const junction = { tipWorkFunctionEV: 4, sampleWorkFunctionEV: 4, gapM: 1e-9, fermiEnergyEV: 5.5 };
    const diagram = barrierDiagram(junction, 0, 0, true);
    const rounded = diagram.imageRounded!;
    // physics core doc example (imageRoundedProfile, 200 slices): 4 eV, 1 nm, mid-gap ≈ 3.00189 eV.
    expect(rounded.energyEV[100]).toBeCloseTo(3.00189, 4);
    expect(rounded.energyEV[100]).toBeLessThan(diagram.trapezoid.energyEV[0]);
  });

  it('wkbDeviation with the image potential compares both currents through the image-rounded barrier', () => {
    const junction = { tipWorkFunctionEV: 4, sampleWorkFunctionEV: 4, gapM: 1e-9, fermiEnergyEV: 5.5 };
    const deviation = wkbDeviation(junction, 0.1, 0, true);
    expect(deviation.barrier).toBe('image-rounded');
    // Rounding lowers the barrier: both currents rise above the trapezoid's (WKB 8.366882e3 A/m²).
    expect(deviation.wkbAPerM2).toBeGreaterThan(8.366882e3);
    expect(deviation.ratio).toBeGreaterThan(0.5);
    expect(deviation.ratio).toBeLessThan(10);
  });

  it('wkbDeviation gives the exact/WKB ratio of the physics core', () => {
    // physics core doc example (exactCurrentDensity): 3.30094e4 A/m² exact, 8.366882e3 A/m² WKB.
    const deviation = wkbDeviation({ tipWorkFunctionEV: 4, sampleWorkFunctionEV: 4, gapM: 1e-9, fermiEnergyEV: 5.5 }, 0.1, 0, false);
    expectRelClose(deviation.ratio, 3.30094e4 / 8.366882e3, 1e-4);
    expect(deviation.barrier).toBe('trapezoid');
    expect(wkbDeviation({ tipWorkFunctionEV: -1, sampleWorkFunctionEV: 4, gapM: 1e-9, fermiEnergyEV: 5.5 }, 0.1, 0, false).error).toMatch(/tipWorkFunctionEV/);
  });
});
