// The motion base editor's draft: every field as the text the person typed, so a half-typed number
// ("1.") is never lost, turned into a motion base input for the shared parser (shared/schemas/motion-base.ts)
// whose issue paths ("leg.min_m", "seats_m[2][1]") name the fields the problems are shown beside.
import { hexapodJointsFromLayout } from '../../../../shared/motion/base-geometry';
import { MotionBaseError, parseMotionBase } from '../../../../shared/schemas/motion-base';
import type { MotionBase, MotionBaseIssue } from '../../../../shared/schemas/motion-base';

/** How the joints are given: the parametric hexapod layout, a hexapod's twelve joints, or a planar stage's six. */
export type BaseMode = 'parametric' | 'joints' | 'planar3';

export interface BaseDraft {
  mode: BaseMode;
  name: string;
  park: string;
  controllerRate_hz: string;
  leg: { min_m: string; max_m: string; speedMax_mps: string; accelMax_mps2: string; forceMax_N: string };
  neutralHeight_m: string;
  layout: {
    baseRadius_m: string;
    platformRadius_m: string;
    baseHalfAngle_deg: string;
    platformHalfAngle_deg: string;
    platformJointZ_m: string;
  };
  /** Six base and six platform joints (x, y, z), m. */
  hexJoints: { base: string[][]; platform: string[][] };
  /** Three base and three platform joints (x, y), m. */
  planarJoints: { base: string[][]; platform: string[][] };
  seats: string[][];
  payloadOn: boolean;
  payload: { mass_kg: string; centreOfMass_m: string[]; inertia_kgm2: string[] };
}

const str = (v: unknown): string => (typeof v === 'number' ? String(v) : typeof v === 'string' ? v : '');
const strs = (v: unknown, n: number): string[] =>
  Array.from({ length: n }, (_, i) => str(Array.isArray(v) ? (v as unknown[])[i] : undefined));
const rows = (v: unknown, count: number, dim: number): string[][] =>
  Array.from({ length: count }, (_, i) => strs(Array.isArray(v) ? (v as unknown[])[i] : undefined, dim));
const obj = (v: unknown): Record<string, unknown> =>
  typeof v === 'object' && v !== null && !Array.isArray(v) ? (v as Record<string, unknown>) : {};
/** Rounds away the last bits of generated coordinates (1e-12 m) so the fields read cleanly. */
const clean = (v: number): string => String(Number(v.toPrecision(12)));

/** Parametric layout values that reproduce `joints` within 1e-6 m, or null when they come from no such layout. */
export function recogniseLayout(
  baseJoints: readonly (readonly number[])[],
  platformJoints: readonly (readonly number[])[],
): BaseDraft['layout'] | null {
  const b0 = baseJoints[0];
  const p0 = platformJoints[0];
  if (!b0 || !p0 || baseJoints.length !== 6 || platformJoints.length !== 6) return null;
  const [bx = NaN, by = NaN] = b0;
  const [px = NaN, py = NaN, pz = 0] = p0;
  const layout = {
    baseRadius_m: Math.hypot(bx, by),
    platformRadius_m: Math.hypot(px, py),
    baseHalfAngle_deg: (-Math.atan2(by, bx) * 180) / Math.PI,
    platformHalfAngle_deg: (Math.atan2(py, px) * 180) / Math.PI + 60,
    platformJointZ_m: pz,
  };
  if (!(layout.baseHalfAngle_deg > 0 && layout.platformHalfAngle_deg > 0)) return null;
  const made = hexapodJointsFromLayout(layout);
  const close = (a: readonly (readonly number[])[], b: readonly (readonly number[])[]) =>
    a.every((j, i) => j.every((v, k) => Math.abs(v - (b[i]?.[k] ?? NaN)) < 1e-6));
  if (!close(made.baseJoints_m, baseJoints) || !close(made.platformJoints_m, platformJoints)) return null;
  return {
    baseRadius_m: clean(layout.baseRadius_m),
    platformRadius_m: clean(layout.platformRadius_m),
    baseHalfAngle_deg: clean(layout.baseHalfAngle_deg),
    platformHalfAngle_deg: clean(layout.platformHalfAngle_deg),
    platformJointZ_m: Math.abs(pz) < 1e-12 ? '' : clean(pz),
  };
}

/** A draft from a stored or imported motion base (any shape: what cannot be read becomes an empty field). */
export function draftFromBase(input: unknown): BaseDraft {
  const b = obj(input);
  const leg = obj(b.leg);
  const payload = b.payload === undefined ? null : obj(b.payload);
  const planar = b.kind === 'planar3';
  const parametric = !planar && 'baseRadius_m' in b;
  const hexJoints = { base: rows(b.baseJoints_m, 6, 3), platform: rows(b.platformJoints_m, 6, 3) };
  let layout: BaseDraft['layout'] = {
    baseRadius_m: str(b.baseRadius_m),
    platformRadius_m: str(b.platformRadius_m),
    baseHalfAngle_deg: str(b.baseHalfAngle_deg),
    platformHalfAngle_deg: str(b.platformHalfAngle_deg),
    platformJointZ_m: str(b.platformJointZ_m),
  };
  let mode: BaseMode = planar ? 'planar3' : parametric ? 'parametric' : 'joints';
  if (mode === 'joints') {
    // A stored hexapod is always in joint form; when its joints are a parametric layout, edit that.
    try {
      const recognised = recogniseLayout(
        hexJoints.base.map((j) => j.map(Number)),
        hexJoints.platform.map((j) => j.map(Number)),
      );
      if (recognised) {
        layout = recognised;
        mode = 'parametric';
      }
    } catch {
      // not a layout: stay with the joints
    }
  }
  const seats = Array.isArray(b.seats_m) ? (b.seats_m as unknown[]).map((s) => strs(s, 3)) : [];
  return {
    mode,
    name: str(b.name),
    park: str(b.park),
    controllerRate_hz: str(b.controllerRate_hz),
    leg: {
      min_m: str(leg.min_m),
      max_m: str(leg.max_m),
      speedMax_mps: str(leg.speedMax_mps),
      accelMax_mps2: str(leg.accelMax_mps2),
      forceMax_N: str(leg.forceMax_N),
    },
    neutralHeight_m: str(b.neutralHeight_m),
    layout,
    hexJoints,
    planarJoints: { base: rows(b.baseJoints_m, 3, 2), platform: rows(b.platformJoints_m, 3, 2) },
    seats: seats.length > 0 ? seats : [['', '', '']],
    payloadOn: payload !== null,
    payload: {
      mass_kg: str(payload?.mass_kg),
      centreOfMass_m: strs(payload?.centreOfMass_m, 3),
      inertia_kgm2: strs(payload?.inertia_kgm2, 6),
    },
  };
}

/** The draft turned into motion base input, with the fields that are empty or not numbers. */
export function draftToInput(draft: BaseDraft): {
  input: Record<string, unknown>;
  issues: MotionBaseIssue[];
} {
  const issues: MotionBaseIssue[] = [];
  const num = (path: string, s: string, optional = false): number | string | undefined => {
    const t = s.trim();
    if (t === '') {
      if (!optional) issues.push({ path, message: 'required' });
      return undefined;
    }
    const v = Number(t);
    if (!Number.isFinite(v)) {
      issues.push({ path, message: `"${t}" is not a number` });
      return t;
    }
    return v;
  };
  const vec = (path: string, values: readonly string[]) => values.map((s, k) => num(`${path}[${k}]`, s));
  const input: Record<string, unknown> = { kind: draft.mode === 'planar3' ? 'planar3' : 'hexapod' };
  if (draft.name.trim()) input.name = draft.name.trim();
  if (draft.mode === 'parametric') {
    const l = draft.layout;
    input.baseRadius_m = num('baseRadius_m', l.baseRadius_m);
    input.platformRadius_m = num('platformRadius_m', l.platformRadius_m);
    input.baseHalfAngle_deg = num('baseHalfAngle_deg', l.baseHalfAngle_deg);
    input.platformHalfAngle_deg = num('platformHalfAngle_deg', l.platformHalfAngle_deg);
    const z = num('platformJointZ_m', l.platformJointZ_m, true);
    if (z !== undefined) input.platformJointZ_m = z;
  } else if (draft.mode === 'joints') {
    input.baseJoints_m = draft.hexJoints.base.map((j, i) => vec(`baseJoints_m[${i}]`, j));
    input.platformJoints_m = draft.hexJoints.platform.map((j, i) => vec(`platformJoints_m[${i}]`, j));
  } else {
    input.baseJoints_m = draft.planarJoints.base.map((j, i) => vec(`baseJoints_m[${i}]`, j));
    input.platformJoints_m = draft.planarJoints.platform.map((j, i) => vec(`platformJoints_m[${i}]`, j));
  }
  if (draft.mode !== 'planar3') {
    input.neutralHeight_m = num('neutralHeight_m', draft.neutralHeight_m);
    if (draft.payloadOn) {
      input.payload = {
        mass_kg: num('payload.mass_kg', draft.payload.mass_kg),
        centreOfMass_m: vec('payload.centreOfMass_m', draft.payload.centreOfMass_m),
        inertia_kgm2: vec('payload.inertia_kgm2', draft.payload.inertia_kgm2),
      };
    }
  }
  const leg: Record<string, unknown> = {
    min_m: num('leg.min_m', draft.leg.min_m),
    max_m: num('leg.max_m', draft.leg.max_m),
    speedMax_mps: num('leg.speedMax_mps', draft.leg.speedMax_mps),
    accelMax_mps2: num('leg.accelMax_mps2', draft.leg.accelMax_mps2),
  };
  const force = num('leg.forceMax_N', draft.leg.forceMax_N, true);
  if (force !== undefined) leg.forceMax_N = force;
  input.leg = leg;
  input.controllerRate_hz = num('controllerRate_hz', draft.controllerRate_hz);
  input.seats_m = draft.seats.map((s, i) => vec(`seats_m[${i}]`, s));
  if (draft.park.trim()) input.park = draft.park.trim();
  return { input, issues };
}

export interface DraftCheck {
  input: Record<string, unknown>;
  /** The validated base in joint form, or null when there are problems. */
  base: MotionBase | null;
  /** Every problem, by the shared parser's path; a field's own ("required", "not a number") first. */
  issues: MotionBaseIssue[];
}

/** Checks a draft with the same shared parser the server uses. */
export function checkDraft(draft: BaseDraft): DraftCheck {
  const { input, issues: own } = draftToInput(draft);
  try {
    const base = parseMotionBase(input);
    return { input, base: own.length === 0 ? base : null, issues: own };
  } catch (error) {
    if (!(error instanceof MotionBaseError)) throw error;
    // A field that is empty or not a number already says so; the parser's "expected number" adds nothing.
    const mine = new Set(own.map((i) => i.path));
    return { input, base: null, issues: [...own, ...error.issues.filter((i) => !mine.has(i.path))] };
  }
}

/** Joint fields filled from the parametric layout (for switching to explicit joints), or null when it is incomplete. */
export function layoutJoints(layout: BaseDraft['layout']): BaseDraft['hexJoints'] | null {
  const p = {
    baseRadius_m: Number(layout.baseRadius_m),
    platformRadius_m: Number(layout.platformRadius_m),
    baseHalfAngle_deg: Number(layout.baseHalfAngle_deg),
    platformHalfAngle_deg: Number(layout.platformHalfAngle_deg),
    platformJointZ_m: layout.platformJointZ_m.trim() === '' ? 0 : Number(layout.platformJointZ_m),
  };
  if (!Object.values(p).every(Number.isFinite) || layout.baseRadius_m.trim() === '') return null;
  const j = hexapodJointsFromLayout(p);
  return {
    base: j.baseJoints_m.map((v) => v.map(clean)),
    platform: j.platformJoints_m.map((v) => v.map(clean)),
  };
}
