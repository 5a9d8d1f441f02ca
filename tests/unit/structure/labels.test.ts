// People words for internal names: every check has a label, units read as SI writes them (BIPM SI
// Brochure, 9th ed., 5.4: symbols in lower case, powers as superscripts).
import { describe, expect, it } from 'vitest';
import { CHECK_LABELS, checkUnit, siUnit, subjectLabel } from '../../../shared/labels';
import { CHECK_NAMES } from '../../../shared/schemas/findings';

describe('labels', () => {
  it('gives every check a label that is not its JSON key', () => {
    for (const check of CHECK_NAMES) {
      expect(CHECK_LABELS[check]).toMatch(/^[A-Z][a-z]/);
      expect(CHECK_LABELS[check]).not.toBe(check);
    }
    expect(CHECK_LABELS.legSpeed).toBe('Leg speed');
    expect(CHECK_LABELS.angularAccel).toBe('Angular acceleration');
    expect(CHECK_LABELS.wrms).toBe('Weighted r.m.s. acceleration');
    expect(CHECK_LABELS.msdv).toBe('Motion sickness dose value');
  });

  it('writes units as SI does', () => {
    expect(siUnit('m/s^2')).toBe('m/s²');
    expect(siUnit('rad/s^2')).toBe('rad/s²');
    expect(siUnit('m/s^3')).toBe('m/s³');
    expect(siUnit('m/s^1.5')).toBe('m/s^1.5');
    expect(siUnit('m/s^1.75')).toBe('m/s^1.75');
    expect(checkUnit('legAccel')).toBe('m/s²');
    expect(checkUnit('legSpeed')).toBe('m/s');
    // A quantity of dimension one has no unit written (BIPM SI Brochure, 9th ed., 2.3.3).
    expect(checkUnit('conditioning')).toBe('');
  });

  it('names legs, seats and axes', () => {
    expect(subjectLabel('leg3')).toBe('Leg 3');
    expect(subjectLabel('seat12')).toBe('Seat 12');
    expect(subjectLabel('z')).toBe('z axis');
    expect(subjectLabel('something')).toBe('something');
  });
});
