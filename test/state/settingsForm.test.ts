import { describe, expect, it } from 'vitest';
import { DEFAULT_SETTINGS, SETTINGS_SCHEMA, type AnalysisSettings } from '../../src/fit/index.ts';
import { editSettings, FIELD_SPECS, fieldText } from '../../src/state/settingsForm.ts';

const base: AnalysisSettings = { ...DEFAULT_SETTINGS, runOverrides: { 'A-gold': { tipRadiusNm: 12 } } };

describe('state/settingsForm', () => {
  it('the form covers every field of the settings schema', () => {
    expect([...FIELD_SPECS.keys()].sort()).toEqual(Object.keys(SETTINGS_SCHEMA).sort());
  });

  it('editSettings accepts a valid session value and returns new settings', () => {
    const { settings, problem } = editSettings(base, null, 'tipWorkFunctionEV', '4.2');
    expect(problem).toBeNull();
    expect(settings.tipWorkFunctionEV).toBe(4.2);
    expect(base.tipWorkFunctionEV).toBeNull();
    expect(editSettings(base, null, 'temperatureK', '4,2').settings.temperatureK).toBe(4.2);
  });

  it("editSettings returns the core's message for an out-of-range or non-numeric value", () => {
    // The message is validateSettings' own (src/fit/settings.ts).
    expect(editSettings(base, null, 'temperatureK', '-4')).toEqual({ settings: base, problem: 'temperatureK must be a number >= 0 and <= 2000 K, got -4' });
    expect(editSettings(base, null, 'tipWorkFunctionEV', 'abc').problem).toBe('tipWorkFunctionEV must be a number >= 0.05 and <= 15 eV or null, got "abc"');
    expect(editSettings(base, 'A-gold', 'tipRadiusNm', '0').problem).toMatch(/^runOverrides\.A-gold\.tipRadiusNm must be a number > 0/);
  });

  it('editSettings on a run: empty text inherits, none sets null, a value overrides', () => {
    const cleared = editSettings(base, 'A-gold', 'tipRadiusNm', '').settings;
    expect(cleared.runOverrides['A-gold']).toBeUndefined();
    const none = editSettings(base, 'A-gold', 'tipRadiusNm', 'none').settings;
    expect(none.runOverrides['A-gold']).toEqual({ tipRadiusNm: null });
    expect(fieldText(none, 'A-gold', 'tipRadiusNm')).toBe('none');
    const set = editSettings(base, 'B-gold', 'imagePotential', 'true').settings;
    expect(set.runOverrides['B-gold']).toEqual({ imagePotential: true });
    expect(fieldText(set, 'B-gold', 'imagePotential')).toBe('true');
    expect(fieldText(set, 'B-gold', 'model')).toBe('');
    expect(fieldText(set, null, 'tipRadiusNm')).toBe('');
  });
});
