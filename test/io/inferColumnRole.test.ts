import { describe, expect, it } from 'vitest';
import { inferColumnRole, segmentFromWord } from '../../src/io/inferColumnRole.ts';
import { parseUnit } from '../../src/io/index.ts';

const roleOf = (name: string, unit = '') => inferColumnRole(name, parseUnit(unit));

describe('inferColumnRole', () => {
  it('inferColumnRole(names of the trade) finds each role', () => {
    expect(roleOf('gap', 'nm').role).toBe('distance');
    expect(roleOf('z').role).toBe('distance');
    expect(roleOf('tip-sample distance').role).toBe('distance');
    expect(roleOf('z piezo', 'nm').role).toBe('piezo');
    expect(roleOf('sample bias', 'mV').role).toBe('bias');
    expect(roleOf('U', 'V').role).toBe('bias');
    expect(roleOf('I', 'pA').role).toBe('current');
    expect(roleOf('I2').role).toBe('current');
    expect(roleOf('dI/dV', 'nS').role).toBe('conductance');
    expect(roleOf('time', 'ms').role).toBe('time');
    expect(roleOf('direction').role).toBe('segment');
    expect(roleOf('curve id').role).toBe('curveId');
    expect(roleOf('curve #').role).toBe('curveId');
    expect(roleOf('point').role).toBe('pointIndex');
    expect(roleOf('x', 'nm').role).toBe('positionX');
    expect(roleOf('Y pos').role).toBe('positionY');
  });

  it('inferColumnRole uses the unit when the name is unknown, and reads A by the name', () => {
    expect(roleOf('signal 3', 'nA').role).toBe('current');
    expect(roleOf('q', 'nm').role).toBe('distance');
    expect(roleOf('z', 'A').unit?.scaleToSI).toBe(1e-10);
    expect(roleOf('I', 'A').unit?.scaleToSI).toBe(1);
    expect(roleOf('z', 'V').role).toBe('piezo');
  });

  it('inferColumnRole reports a conflict when name and unit disagree, and reads segment words', () => {
    const guess = roleOf('current', 'nm');
    expect(guess.role).toBe('distance');
    expect(guess.conflict).toContain('current');
    expect(roleOf('I retract', 'pA').segmentHint).toBe('retract');
    expect(roleOf('current app').segmentHint).toBe('approach');
    expect(segmentFromWord('Approach')).toBe('approach');
    expect(segmentFromWord('bwd')).toBe('retract');
    expect(segmentFromWord('sideways')).toBeUndefined();
  });
});
