// The run page puts first the chart group where the run is closest to (or over) a limit.
import { describe, expect, it } from 'vitest';
import { CHECK_NAMES, CHECK_SEVERITY } from '../../../shared/schemas/findings';
import { CHECK_GROUP, chartGroupOrder } from '../../../src/features/runs/utils/chart-order';

describe('chartGroupOrder', () => {
  it('orders the groups by the largest use among their checks', () => {
    const { order, worst } = chartGroupOrder([
      { check: 'stroke', ratio: 0.47 },
      { check: 'jerk', ratio: 1.45 },
      { check: 'legSpeed', ratio: 0.45 },
      { check: 'outOfBand', ratio: 0.1 },
      { check: 'envelope', ratio: 0.42 },
    ]);
    expect(order).toEqual(['rider', 'actuators', 'pose']);
    expect(worst).toEqual({ rider: 1.45, actuators: 0.47, pose: 0.1 });
  });

  it('keeps actuators, rider, pose when nothing is reported, and groups without uses last', () => {
    expect(chartGroupOrder([]).order).toEqual(['actuators', 'rider', 'pose']);
    expect(chartGroupOrder([{ check: 'startEnd', ratio: 0.2 }]).order).toEqual([
      'pose',
      'actuators',
      'rider',
    ]);
  });

  it('puts every check in a group, the actuator checks with the legs', () => {
    for (const check of CHECK_NAMES) expect(CHECK_GROUP[check]).toBeDefined();
    // Every hard actuator limit (common practice: stroke, speed, acceleration, force of each leg).
    for (const check of ['stroke', 'legSpeed', 'legAccel', 'legForce'] as const) {
      expect(CHECK_GROUP[check]).toBe('actuators');
      expect(CHECK_SEVERITY[check]).toBe('hard');
    }
  });
});
