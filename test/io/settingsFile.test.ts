import { describe, expect, it } from 'vitest';
import { isSettingsFileName, readSettingsText } from '../../src/io/settingsFile.ts';

describe('settings files kept with the data', () => {
  it('isSettingsFileName takes settings.json and names ending in -, _ or .settings.json, nothing else', () => {
    for (const name of ['settings.json', 'runs/Settings.JSON', 'Tarn-run-settings.json', 'tip_settings.json', 'b.settings.json', 'C:\\data\\settings.json']) {
      expect(isSettingsFileName(name), name).toBe(true);
    }
    for (const name of ['mysettings.json', 'settings.json.bak', 'results.json', 'settings.csv', 'demo.burrow-session.json', 'settings/approach.csv']) {
      expect(isSettingsFileName(name), name).toBe(false);
    }
  });

  it('reads valid settings, over the defaults', () => {
    const read = readSettingsText('{ "temperatureK": 4.2, "runOverrides": { "tip-A": { "tipRadiusNm": 8 } } }', 'settings.json');
    expect(read.ok).toBe(true);
    if (!read.ok) return;
    expect(read.settings.temperatureK).toBe(4.2);
    expect(read.settings.runOverrides['tip-A'].tipRadiusNm).toBe(8);
  });

  it('names the file, line and column of a bad field, also inside a run override', () => {
    const text = '{\n  "temperatureK": -3,\n  "runOverrides": {\n    "tip-A": { "fermiEnergyEV": 5 },\n    "tip.B": { "tipRadiusNm": "big" }\n  }\n}\n';
    const read = readSettingsText(text, 'day1/settings.json');
    expect(read.ok).toBe(false);
    if (read.ok) return;
    const lines = read.message.split('\n');
    expect(lines[0]).toMatch(/^day1\/settings\.json:2:3: temperatureK must be a number >= 0/);
    // The run name holds a dot: the key is still found after it (line 5, column 16).
    expect(lines[1]).toMatch(/^day1\/settings\.json:5:16: runOverrides\.tip\.B\.tipRadiusNm must be a number > 0/);
  });

  it('names the line and column where the JSON breaks, and rejects a top level that is not an object', () => {
    const broken = readSettingsText('{\n  "temperatureK": 300,\n  oops\n}', 'settings.json');
    expect(broken.ok === false && broken.message).toMatch(/^settings\.json:3:\d+: settings file is not valid JSON/);
    const list = readSettingsText('[1, 2]', 'settings.json');
    expect(list.ok === false && list.message).toBe('settings.json:1:1: settings must be a JSON object, got an array');
  });
});
