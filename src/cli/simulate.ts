import { writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { parseArgs, UsageError, type FlagSpecs } from './args.ts';
import type { Command } from './command.ts';
import {
  currentDensityModels,
  ELEMENTARY_CHARGE_C,
  imageRoundedProfile,
  sampledCurrentDensity,
  type CurrentDensityModel,
  nmToM,
  mToNm,
  nm2ToM2,
  m2ToNm2,
  simulateCurve,
  type CurrentDensityModelName,
  type SimulationInput,
  type SimulationResult,
} from '../physics/index.ts';

const flags: FlagSpecs = {
  kind: { kind: 'string', help: 'iv: sweep the bias at fixed gap; iz: sweep the gap at fixed bias', choices: ['iv', 'iz'], default: 'iv' },
  model: { kind: 'string', help: 'current model: WKB trapezoid, Simmons intermediate-voltage, exact transfer matrix', choices: ['wkb', 'simmons', 'exact'], default: 'wkb' },
  'tip-work-function-ev': { kind: 'number', help: 'tip work function φ1, eV', min: 0.05, max: 20, minExclusive: false, default: 4.5 },
  'sample-work-function-ev': { kind: 'number', help: 'sample work function φ2, eV', min: 0.05, max: 20, default: 4.5 },
  'gap-nm': { kind: 'number', help: 'tip–sample gap (fixed gap of an iv sweep), nm', min: 0.05, max: 10, default: 0.8 },
  'area-nm2': { kind: 'number', help: 'effective tunnelling area, nm² (or give --tip-radius-nm)', min: 0, minExclusive: true, max: 1e8 },
  'tip-radius-nm': { kind: 'number', help: 'paraboloid tip apex radius, nm; area = πR/κ', min: 0, minExclusive: true, max: 1e5 },
  'temperature-k': { kind: 'number', help: 'temperature, K', min: 0, max: 2000, default: 300 },
  'fermi-energy-ev': { kind: 'number', help: 'Fermi energy above the band bottom, eV', min: 0.1, max: 50, default: 5.5 },
  'bias-v': { kind: 'number', help: 'sample bias of one iv point, or the fixed bias of an iz sweep, V', min: -20, max: 20, default: 0.1 },
  from: { kind: 'number', help: 'sweep start: bias in V (iv) or gap in nm (iz)' },
  to: { kind: 'number', help: 'sweep end: bias in V (iv) or gap in nm (iz)' },
  points: { kind: 'number', help: 'number of sweep points', min: 1, max: 1_000_000, integer: true, default: 101 },
  'noise-relative': { kind: 'number', help: 'multiplicative noise σ (0.01 = 1 %)', min: 0, max: 10, default: 0 },
  'noise-floor-a': { kind: 'number', help: 'additive current noise σ, A', min: 0, max: 1, default: 0 },
  seed: { kind: 'number', help: 'noise generator seed', min: 0, max: 4294967295, integer: true, default: 1 },
  'image-potential': { kind: 'boolean', help: 'round the barrier by the exact image potential (wkb model only; physics.md §6)' },
  out: { kind: 'string', help: 'write CSV to this file instead of stdout' },
  json: { kind: 'boolean', help: 'print machine-readable JSON instead of CSV' },
};

export const simulateCommand: Command = {
  name: 'simulate',
  summary: 'Compute a model I(V) spectrum or I(z) approach curve (optionally noisy) as CSV or JSON',
  usage: 'burrow simulate --kind iv|iz [--model wkb|simmons|exact] [junction flags] [--from A --to B --points N] [--out FILE.csv | --json]',
  flags,
  async run(argv, io) {
    const { flags: f, positionals } = parseArgs('simulate', argv, flags);
    if (positionals.length) throw new UsageError(`burrow simulate: unexpected argument '${positionals[0]}'; all inputs are --flags`);
    const input = simulationInputFromFlags(f);
    const result = simulateCurve(input);
    if (f.json) {
      io.stdout(JSON.stringify(simulationJson(input, result, modelName(f)), null, 1) + '\n');
      return 0;
    }
    const csv = simulationCsv(input, result, modelName(f));
    if (typeof f.out === 'string') {
      writeFileSync(resolve(io.cwd, f.out), csv);
      io.stderr(`burrow simulate: wrote ${result.points.length} points to ${f.out}\n`);
    } else io.stdout(csv);
    return 0;
  },
};

type Flags = Record<string, number | string | boolean | undefined>;

const modelName = (f: Flags): string => `${f.model as string}${f['image-potential'] ? ' with image potential' : ''}`;

/** WKB current through the image-rounded barrier (400 slices; only the wkb model takes the image term). */
function imageRoundedCurrentDensity(model: string): CurrentDensityModel {
  if (model !== 'wkb') throw new UsageError(`burrow simulate: --image-potential goes with --model wkb, got --model ${model}`);
  return (junction, biasV, temperatureK) => sampledCurrentDensity(imageRoundedProfile(junction, biasV, { slices: 400 }), temperatureK);
}

function simulationInputFromFlags(f: Flags): SimulationInput {
  const kind = f.kind as 'iv' | 'iz';
  if (f['area-nm2'] !== undefined && f['tip-radius-nm'] !== undefined) {
    throw new UsageError('burrow simulate: give either --area-nm2 or --tip-radius-nm, not both');
  }
  const area =
    f['tip-radius-nm'] !== undefined ? { tipRadiusM: nmToM(f['tip-radius-nm'] as number) } : { areaM2: nm2ToM2((f['area-nm2'] as number | undefined) ?? 1) };
  const hasFrom = f.from !== undefined;
  const hasTo = f.to !== undefined;
  if (hasFrom !== hasTo) throw new UsageError('burrow simulate: --from and --to go together');
  let sweep: SimulationInput['sweep'];
  if (hasFrom) {
    const from = f.from as number;
    const to = f.to as number;
    if (kind === 'iv') {
      for (const [name, value] of [['from', from], ['to', to]] as const) {
        if (!(value >= -20 && value <= 20)) throw new UsageError(`burrow simulate: --${name} must be a bias between -20 and 20 V for --kind iv, got '${value}'`);
      }
      sweep = { from, to, points: f.points as number };
    } else {
      for (const [name, value] of [['from', from], ['to', to]] as const) {
        if (!(value > 0.01 && value <= 10)) throw new UsageError(`burrow simulate: --${name} must be a gap > 0.01 and <= 10 nm for --kind iz, got '${value}'`);
      }
      sweep = { from: nmToM(from), to: nmToM(to), points: f.points as number };
    }
  } else if (kind === 'iv') {
    sweep = { from: -1, to: 1, points: f.points as number };
  } else {
    const gapNm = f['gap-nm'] as number;
    sweep = { from: nmToM(Math.max(0.2, gapNm - 0.3)), to: nmToM(gapNm + 0.3), points: f.points as number };
  }
  const noiseRelative = f['noise-relative'] as number;
  const noiseFloorA = f['noise-floor-a'] as number;
  return {
    kind,
    junction: {
      tipWorkFunctionEV: f['tip-work-function-ev'] as number,
      sampleWorkFunctionEV: f['sample-work-function-ev'] as number,
      gapM: nmToM(f['gap-nm'] as number),
      fermiEnergyEV: f['fermi-energy-ev'] as number,
    },
    currentDensity: f['image-potential'] ? imageRoundedCurrentDensity(f.model as string) : currentDensityModels[f.model as CurrentDensityModelName],
    area,
    temperatureK: f['temperature-k'] as number,
    biasV: f['bias-v'] as number,
    sweep,
    noise: noiseRelative > 0 || noiseFloorA > 0 ? { relative: noiseRelative, floorA: noiseFloorA, seed: f.seed as number } : undefined,
  };
}

function simulationJson(input: SimulationInput, result: SimulationResult, model: string) {
  return {
    kind: result.kind,
    model,
    inputsSI: {
      tipWorkFunctionJ: input.junction.tipWorkFunctionEV * ELEMENTARY_CHARGE_C,
      sampleWorkFunctionJ: input.junction.sampleWorkFunctionEV * ELEMENTARY_CHARGE_C,
      tipWorkFunctionEV: input.junction.tipWorkFunctionEV,
      sampleWorkFunctionEV: input.junction.sampleWorkFunctionEV,
      gapM: input.junction.gapM,
      fermiEnergyEV: input.junction.fermiEnergyEV,
      areaM2: result.areaM2,
      tipRadiusM: 'tipRadiusM' in input.area ? input.area.tipRadiusM : null,
      temperatureK: input.temperatureK,
      biasV: input.biasV,
      sweep: input.sweep ?? null,
      noise: input.noise ?? null,
    },
    points: result.points.map((p) => ({
      biasV: p.biasV,
      gapNm: mToNm(p.gapM),
      currentA: p.currentA,
      currentDensityAPerM2: p.currentDensityAPerM2,
      conductanceS: Number.isFinite(p.conductanceS) ? p.conductanceS : null,
    })),
  };
}

/**
 * The simple CSV that `burrow simulate` writes: `#` metadata lines (key: value with units), then a
 * header with units in parentheses and one row per point.
 */
export function simulationCsv(input: SimulationInput, result: SimulationResult, model: string): string {
  const j = input.junction;
  const lines = [
    `# burrow simulate`,
    `# kind: ${result.kind}`,
    `# model: ${model}`,
    `# tip work function (eV): ${j.tipWorkFunctionEV}`,
    `# sample work function (eV): ${j.sampleWorkFunctionEV}`,
    ...(result.kind === 'iv' ? [`# gap (nm): ${mToNm(j.gapM)}`] : [`# bias (V): ${input.biasV}`]),
    `# area (nm2): ${m2ToNm2(result.areaM2)}`,
    ...('tipRadiusM' in input.area ? [`# tip radius (nm): ${mToNm(input.area.tipRadiusM)}`] : []),
    `# temperature (K): ${input.temperatureK}`,
    `# fermi energy (eV): ${j.fermiEnergyEV}`,
    ...(input.noise ? [`# noise relative: ${input.noise.relative}`, `# noise floor (A): ${input.noise.floorA}`, `# seed: ${input.noise.seed}`] : []),
    result.kind === 'iv' ? 'bias (V),current (A)' : 'z (nm),current (A)',
  ];
  for (const p of result.points) {
    const x = result.kind === 'iv' ? p.biasV : mToNm(p.gapM);
    lines.push(`${x},${p.currentA}`);
  }
  return lines.join('\n') + '\n';
}

