// The motion base editor's draft: stored joints are recognised as the parametric layout only when the
// layout reproduces them, and the form gives back the same base the shared parser makes of the JSON.
import { describe, expect, it } from 'vitest';
import {
  checkDraft,
  draftFromBase,
  draftToInput,
} from '../../../src/features/venue-settings/components/base-draft';
import {
  demoHexapodBase,
  demoHexapodInput,
  demoPlanar3Base,
  parseMotionBase,
} from '../../../shared/schemas/motion-base';

describe('motion base draft', () => {
  it('opens the stored demo joints as the demo layout and gives back the same joints', () => {
    const draft = draftFromBase(demoHexapodBase);
    expect(draft.mode).toBe('parametric');
    expect(draft.layout).toEqual({
      baseRadius_m: '1.5',
      platformRadius_m: '1',
      baseHalfAngle_deg: '10',
      platformHalfAngle_deg: '10',
      platformJointZ_m: '',
    });
    const check = checkDraft(draft);
    expect(check.issues).toEqual([]);
    const base = check.base!;
    if (base.kind !== 'hexapod') throw new Error('expected a hexapod');
    base.baseJoints_m.forEach((j, i) =>
      j.forEach((v, k) => expect(v).toBeCloseTo(demoHexapodBase.baseJoints_m[i]![k]!, 9)),
    );
    base.platformJoints_m.forEach((j, i) =>
      j.forEach((v, k) => expect(v).toBeCloseTo(demoHexapodBase.platformJoints_m[i]![k]!, 9)),
    );
    expect(check.input.baseRadius_m).toBe(demoHexapodInput.baseRadius_m);
  });

  it('keeps joints that no layout makes (one joint moved 1 mm) as joints', () => {
    const moved = structuredClone(demoHexapodBase);
    moved.platformJoints_m[3]![0] += 0.001;
    const draft = draftFromBase(moved);
    expect(draft.mode).toBe('joints');
    expect(checkDraft(draft).base).toEqual(parseMotionBase(moved));
  });

  it('reads a planar stage and names empty and non-numeric fields by their schema path', () => {
    const draft = draftFromBase(demoPlanar3Base);
    expect(draft.mode).toBe('planar3');
    expect(checkDraft(draft).base).toEqual(demoPlanar3Base);
    draft.leg.max_m = '';
    draft.seats[1]![2] = 'high';
    expect(draftToInput(draft).issues).toEqual([
      { path: 'leg.max_m', message: 'required' },
      { path: 'seats_m[1][2]', message: '"high" is not a number' },
    ]);
    expect(checkDraft(draft).base).toBeNull();
  });
});
