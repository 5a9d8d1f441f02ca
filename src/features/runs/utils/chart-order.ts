// Which chart group a reviewer should see first: the one where the run is closest to (or over) a
// limit. Each check belongs to the group whose charts show what it measures.
import type { CheckName, Use } from '../../../../shared/schemas/findings';

export type OrderedGroup = 'rider' | 'pose' | 'actuators';

/** The chart group that shows what each check measures. */
export const CHECK_GROUP: Readonly<Record<CheckName, OrderedGroup>> = {
  envelope: 'rider',
  jerk: 'rider',
  wrms: 'rider',
  msdv: 'rider',
  vdv: 'rider',
  angularSpeed: 'rider',
  angularAccel: 'rider',
  startEnd: 'pose',
  outOfBand: 'pose',
  conditioning: 'pose',
  stroke: 'actuators',
  legSpeed: 'actuators',
  legAccel: 'actuators',
  legForce: 'actuators',
};

const DEFAULT_ORDER: readonly OrderedGroup[] = ['actuators', 'rider', 'pose'];

/**
 * The groups ordered by the largest use among their checks, largest first; groups with no use keep
 * the default order (actuators, rider, pose) after the others. Ties keep the default order too.
 */
export function chartGroupOrder(uses: readonly Pick<Use, 'check' | 'ratio'>[]): {
  order: OrderedGroup[];
  worst: Partial<Record<OrderedGroup, number>>;
} {
  const worst: Partial<Record<OrderedGroup, number>> = {};
  for (const use of uses) {
    const group = CHECK_GROUP[use.check];
    if (!Number.isFinite(use.ratio)) continue;
    worst[group] = Math.max(worst[group] ?? Number.NEGATIVE_INFINITY, use.ratio);
  }
  const order = [...DEFAULT_ORDER].sort((a, b) => {
    const wa = worst[a] ?? Number.NEGATIVE_INFINITY;
    const wb = worst[b] ?? Number.NEGATIVE_INFINITY;
    return wb - wa || DEFAULT_ORDER.indexOf(a) - DEFAULT_ORDER.indexOf(b);
  });
  return { order, worst };
}
