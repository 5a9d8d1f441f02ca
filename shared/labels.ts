// What people read for the product's internal names: check keys, subjects and units. The JSON keys
// stay as they are for programs; screens and package reports show these words, from this one table.
import type { CheckName } from './schemas/findings';
import { CHECK_UNIT } from './schemas/findings';

/** Each check in people words (sentence case). */
export const CHECK_LABELS: Readonly<Record<CheckName, string>> = {
  stroke: 'Leg stroke',
  legSpeed: 'Leg speed',
  legAccel: 'Leg acceleration',
  envelope: 'Rider acceleration envelope',
  jerk: 'Rider jerk',
  angularSpeed: 'Angular speed',
  angularAccel: 'Angular acceleration',
  msdv: 'Motion sickness dose value',
  wrms: 'Weighted r.m.s. acceleration',
  vdv: 'Vibration dose value',
  conditioning: 'Kinematic conditioning',
  startEnd: 'Start and end at neutral',
  outOfBand: 'Motion above the controller band',
  legForce: 'Actuator force',
};

/** Severity tiers in people words. */
export const TIER_LABELS = { hard: 'Hard limit', comfort: 'Comfort limit' } as const;

const SUPERSCRIPTS: Record<string, string> = { '2': '²', '3': '³' };

/**
 * A unit as SI writes it (BIPM SI Brochure, 9th ed., section 5.4): lower-case symbols, integer
 * powers as superscripts (m/s², rad/s³). A fractional power stays written out (m/s^1.5), and so
 * does the word list of a check whose unit varies.
 */
export function siUnit(unit: string): string {
  return unit.replace(/\^([23])(?![\d.])/g, (_m, p: string) => SUPERSCRIPTS[p] ?? `^${p}`);
}

/**
 * The unit of a check's value and limit, as SI writes it; empty for a quantity of dimension one
 * (the condition number), whose unit 1 is not written (BIPM SI Brochure, 9th ed., section 2.3.3).
 */
export function checkUnit(check: CheckName): string {
  const unit = CHECK_UNIT[check];
  return unit === '1' ? '' : siUnit(unit);
}

/** "leg3" → "Leg 3", "seat2" → "Seat 2", "x" → "x axis", "start" → "Start"; anything else as it is. */
export function subjectLabel(subject: string): string {
  const numbered = /^(leg|seat)(\d+)$/.exec(subject);
  if (numbered) return `${numbered[1] === 'leg' ? 'Leg' : 'Seat'} ${numbered[2]}`;
  if (subject === 'x' || subject === 'y' || subject === 'z') return `${subject} axis`;
  if (subject === 'start' || subject === 'end') return subject === 'start' ? 'Start' : 'End';
  return subject;
}
