// Every parameter of a cueing profile as a labelled control, grouped as the schema groups them
// (shared/schemas/cueing-profile.ts): gains, input limits, the translational high-pass per axis, tilt
// coordination, the rotational high-pass per axis, the rider reference point and the pose limits. Each
// field names its path in the profile (the zod issue path, so a problem lands beside its field), its
// unit and its default (DEFAULT_CUEING_PROFILE, common practice, not a standard).
import { DEFAULT_CUEING_PROFILE } from '../../../../shared/schemas/cueing-profile';
import { formatJsonPath } from '../../../../shared/schemas/json-input';

export type FieldPath = readonly (string | number)[];

export interface NumberField {
  path: FieldPath;
  label: string;
  unit: string;
  /** Shown only when the axis' filter has this order (translational and rotational high-pass). */
  orders?: readonly number[];
}

export interface FieldGroup {
  title: string;
  /** What the group does, in a line. */
  hint: string;
  /** The high-pass groups: path of the axis whose `order` selects the filter. */
  orderPath?: FieldPath;
  orderChoices?: readonly number[];
  fields: readonly NumberField[];
}

const AXIS_NAMES = { x: 'x (surge)', y: 'y (sway)', z: 'z (heave)' } as const;
const ROT_NAMES = { x: 'x (roll)', y: 'y (pitch)', z: 'z (yaw)' } as const;

const translational = (axis: 'x' | 'y' | 'z'): FieldGroup => ({
  title: `Translational high-pass, ${AXIS_NAMES[axis]}`,
  hint: 'Washes out sustained specific force; order 3 adds a break pole that returns the platform to neutral.',
  orderPath: ['translational', axis, 'order'],
  orderChoices: [2, 3],
  fields: [
    { path: ['translational', axis, 'naturalFrequency_radps'], label: 'Natural frequency', unit: 'rad/s' },
    { path: ['translational', axis, 'damping'], label: 'Damping ratio', unit: '–' },
    {
      path: ['translational', axis, 'breakFrequency_radps'],
      label: 'Break frequency',
      unit: 'rad/s',
      orders: [3],
    },
  ],
});

const rotational = (axis: 'x' | 'y' | 'z'): FieldGroup => ({
  title: `Rotational high-pass, ${ROT_NAMES[axis]}`,
  hint: 'Passes the onset of the body rate and washes the angle back to neutral.',
  orderPath: ['rotational', axis, 'order'],
  orderChoices: [1, 2],
  fields: [
    { path: ['rotational', axis, 'frequency_radps'], label: 'Break frequency', unit: 'rad/s' },
    { path: ['rotational', axis, 'damping'], label: 'Damping ratio', unit: '–', orders: [2] },
  ],
});

export const CUEING_FIELD_GROUPS: readonly FieldGroup[] = [
  {
    title: 'Gains',
    hint: 'Surge, sway and heave scale the specific force; roll, pitch and yaw the angular velocity.',
    fields: (['surge', 'sway', 'heave', 'roll', 'pitch', 'yaw'] as const).map((k) => ({
      path: ['scale', k],
      label: k[0]!.toUpperCase() + k.slice(1),
      unit: '×',
    })),
  },
  {
    title: 'Input limits',
    hint: 'Soft limits on the scaled input: linear below the knee (a fraction of the limit), then bending toward it.',
    fields: [
      { path: ['inputLimit', 'specificForce_mps2', 'limit'], label: 'Specific force limit', unit: 'm/s²' },
      { path: ['inputLimit', 'specificForce_mps2', 'knee'], label: 'Specific force knee', unit: '× limit' },
      { path: ['inputLimit', 'angularRate_radps', 'limit'], label: 'Angular rate limit', unit: 'rad/s' },
      { path: ['inputLimit', 'angularRate_radps', 'knee'], label: 'Angular rate knee', unit: '× limit' },
    ],
  },
  translational('x'),
  translational('y'),
  translational('z'),
  {
    title: 'Tilt coordination',
    hint: 'Low-passed surge and sway force rendered as pitch and roll, within the rate, acceleration and angle limits.',
    fields: [
      { path: ['tilt', 'lowPassFrequency_radps'], label: 'Low-pass frequency', unit: 'rad/s' },
      { path: ['tilt', 'damping'], label: 'Damping ratio', unit: '–' },
      { path: ['tilt', 'rateLimit_degps'], label: 'Rate limit', unit: '°/s' },
      { path: ['tilt', 'accelLimit_degps2'], label: 'Acceleration limit', unit: '°/s²' },
      { path: ['tilt', 'angleLimit_deg'], label: 'Angle limit', unit: '°' },
    ],
  },
  rotational('x'),
  rotational('y'),
  rotational('z'),
  {
    title: 'Rider reference point',
    hint: 'Where the vehicle force applies, in the platform frame (x forward, y left, z up).',
    fields: [0, 1, 2].map((i) => ({
      path: ['riderReference_m', i],
      label: ['x', 'y', 'z'][i]!,
      unit: 'm',
    })),
  },
  {
    title: 'Pose limits',
    hint: 'Soft limits on the pose offsets from neutral: the cued pose never leaves them.',
    fields: [
      { path: ['poseLimit', 'x_m'], label: 'x', unit: 'm' },
      { path: ['poseLimit', 'y_m'], label: 'y', unit: 'm' },
      { path: ['poseLimit', 'z_m'], label: 'z', unit: 'm' },
      { path: ['poseLimit', 'roll_deg'], label: 'Roll', unit: '°' },
      { path: ['poseLimit', 'pitch_deg'], label: 'Pitch', unit: '°' },
      { path: ['poseLimit', 'yaw_deg'], label: 'Yaw', unit: '°' },
      { path: ['poseLimit', 'knee'], label: 'Knee', unit: '× limit' },
    ],
  },
];

/** The path as the shared parsers name it in their issues (formatJsonPath), e.g. "tilt.angleLimit_deg". */
export const pathKey = (path: FieldPath): string => formatJsonPath(path);

export function getAt(value: unknown, path: FieldPath): unknown {
  let v: unknown = value;
  for (const k of path) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<string | number, unknown>)[k];
  }
  return v;
}

/** A copy of `value` with `path` set (or removed, for undefined); missing objects and arrays are made. */
export function setAt(value: unknown, path: FieldPath, next: unknown): unknown {
  if (path.length === 0) return next;
  const [head, ...rest] = path as [string | number, ...(string | number)[]];
  const base: Record<string | number, unknown> | unknown[] = Array.isArray(value)
    ? [...(value as unknown[])]
    : value !== null && typeof value === 'object'
      ? { ...(value as Record<string, unknown>) }
      : typeof head === 'number'
        ? []
        : {};
  const child = setAt((base as Record<string | number, unknown>)[head], rest, next);
  if (child === undefined && !Array.isArray(base)) delete (base as Record<string | number, unknown>)[head];
  else (base as Record<string | number, unknown>)[head] = child;
  return base;
}

/** The default of a field (common practice, not a standard). */
export const defaultOf = (path: FieldPath): unknown => getAt(DEFAULT_CUEING_PROFILE, path);

/**
 * Changes a high-pass axis to another order: the fields of the new order get their defaults when
 * missing, the ones it lacks are removed (the schema refuses unknown keys).
 */
export function withOrder(draft: unknown, orderPath: FieldPath, order: number, group: FieldGroup): unknown {
  let next = setAt(draft, orderPath, order);
  for (const f of group.fields) {
    if (!f.orders) continue;
    if (f.orders.includes(order)) {
      if (getAt(next, f.path) === undefined) next = setAt(next, f.path, fallbackDefault(f.path));
    } else next = setAt(next, f.path, undefined);
  }
  return next;
}

/** A field's default, or, for a field the default profile's order leaves out, a common-practice value. */
function fallbackDefault(path: FieldPath): unknown {
  const d = defaultOf(path);
  if (d !== undefined) return d;
  // The default translational filters are third order and the rotational second order: the fields an
  // order switch adds back come from those (damping 1, break frequency 0.5 rad/s).
  return path[path.length - 1] === 'damping' ? 1 : 0.5;
}
