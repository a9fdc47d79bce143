import { fitApproachCurve, fitSpectrum, jointFit, settingsForRun, type AnalysisSettings, type UncertaintyNarrowing } from '../fit/index.ts';
import { approachFitInput, runOf, spectrumFitInput, type CurveInput, type CurveResult } from './analyzeCurve.ts';
import type { SitePair } from './pairSites.ts';

/** The joint I(z) + I(V) result of one site, attached to the spectrum's record. */
/** The barrier values and errors a spectrum record carries (same names and units). */
type BarrierValues = Pick<
  CurveResult,
  'phi1EV' | 'phi1ErrEV' | 'phi2EV' | 'phi2ErrEV' | 'meanBarrierEV' | 'meanBarrierErrEV' | 'asymmetryEV' | 'asymmetryErrEV' | 'widthNm' | 'widthErrNm' | 'areaNm2' | 'areaErrNm2'
>;

export interface JointSiteResult extends BarrierValues {
  approachCurve: string;
  spectrumCurve: string;
  pairedBy: SitePair['by'];
  status: 'ok' | 'failed';
  message: string;
  approachGapNm: number | null;
  reducedChi2: number | null;
  /** How much narrower each joint error bar is than the lone spectrum's (see UncertaintyNarrowing). */
  narrowing: (Omit<UncertaintyNarrowing, 'factor'> & { factor: number | null })[];
}

const finite = (value: number): number | null => (Number.isFinite(value) ? value : null);

/**
 * Fit an approach curve and a spectrum of one site together with shared barrier parameters
 * (jointFit), from their own separate fits (made with the same inputs as analyzeCurve). The area is
 * shared and fitted: the approach curve's slope pins the barrier that the lone spectrum leaves
 * loose. The narrowing compares with the lone spectrum fit as the settings configure it.
 * @example analyzeJoint(curves[pair.approach], curves[pair.spectrum], pair.by, settings).meanBarrierEV
 */
export function analyzeJoint(approach: CurveInput, spectrum: CurveInput, pairedBy: SitePair['by'], sessionSettings: AnalysisSettings): JointSiteResult {
  const settings = settingsForRun(sessionSettings, runOf(spectrum));
  const base: JointSiteResult = {
    approachCurve: approach.id,
    spectrumCurve: spectrum.id,
    pairedBy,
    status: 'failed',
    message: '',
    phi1EV: null,
    phi1ErrEV: null,
    phi2EV: null,
    phi2ErrEV: null,
    meanBarrierEV: null,
    meanBarrierErrEV: null,
    asymmetryEV: null,
    asymmetryErrEV: null,
    widthNm: null,
    widthErrNm: null,
    areaNm2: null,
    areaErrNm2: null,
    approachGapNm: null,
    reducedChi2: null,
    narrowing: [],
  };
  try {
    // The same inputs as the lone fits of analyzeCurve (settings, preamp limit, window, clipped
    // points of the spectrum left out).
    const approachInput = approachFitInput(approach, settings);
    const approachFit = fitApproachCurve(approachInput);
    if (approachFit.status !== 'ok') return { ...base, message: `approach curve: ${approachFit.message}` };
    const { input: spectrumInput } = spectrumFitInput(spectrum, settings);
    const spectrumFit = fitSpectrum(spectrumInput);
    const joint = jointFit({
      approach: { zM: approachInput.zM, currentA: approachInput.currentA, biasV: approachInput.biasV, fit: approachFit },
      spectrum: { biasV: spectrumInput.biasV, currentA: spectrumInput.currentA, fit: spectrumFit },
      temperatureK: settings.temperatureK,
      fermiEnergyEV: settings.fermiEnergyEV,
    });
    const e = joint.estimate;
    return {
      ...base,
      status: e.converged ? 'ok' : 'failed',
      message: e.message,
      phi1EV: finite(e.tipWorkFunctionEV),
      phi1ErrEV: finite(e.tipWorkFunctionErrorEV),
      phi2EV: finite(e.sampleWorkFunctionEV),
      phi2ErrEV: finite(e.sampleWorkFunctionErrorEV),
      meanBarrierEV: finite(e.meanBarrierEV),
      meanBarrierErrEV: finite(e.meanBarrierErrorEV),
      asymmetryEV: finite(e.asymmetryEV),
      asymmetryErrEV: finite(e.asymmetryErrorEV),
      widthNm: finite(e.widthM * 1e9),
      widthErrNm: finite(e.widthErrorM * 1e9),
      areaNm2: finite(e.areaM2 * 1e18),
      areaErrNm2: finite(e.areaErrorM2 * 1e18),
      approachGapNm: finite(joint.approachGapM * 1e9),
      reducedChi2: finite(e.reducedChi2),
      narrowing: joint.narrowing.map((n) => ({ ...n, factor: finite(n.factor) })),
    };
  } catch (error) {
    return { ...base, message: `joint fit failed: ${(error as Error).message}` };
  }
}
