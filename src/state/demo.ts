/// <reference types="vite/client" />
/**
 * The demo session bundled into the app: every export in the top-level sample-data/ folder (an
 * invented scenario of two tips on gold and graphite: approach curves, spectra, a 6×6 grid and a few
 * spoiled curves) with its settings file (per-run tip radii). Vite inlines the texts at build time.
 */
import { validateSettings, type AnalysisSettings } from '../fit/index.ts';
import demoSettingsJson from '../../sample-data/settings.json';

const texts = import.meta.glob('/sample-data/*.{csv,tsv,txt,dat}', { query: '?raw', import: 'default', eager: true }) as Record<string, string>;

/** The demo files, by file name, in name order. */
export const DEMO_FILES: readonly { fileName: string; text: string }[] = Object.entries(texts)
  .map(([path, text]) => ({ fileName: path.slice(path.lastIndexOf('/') + 1), text }))
  .sort((a, b) => (a.fileName < b.fileName ? -1 : a.fileName > b.fileName ? 1 : 0));

/** The demo settings, validated like any settings file (problems would be a bug in the demo data). */
export function demoSettings(): AnalysisSettings {
  return validateSettings(demoSettingsJson).settings;
}

/** The name a new demo session gets. */
export const DEMO_SESSION_NAME = 'Demo: two tips on gold and graphite';
