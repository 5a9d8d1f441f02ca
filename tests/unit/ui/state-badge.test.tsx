// @vitest-environment jsdom
// The two colour scales stay apart: a run or release state is never drawn in the use scale's
// colours (teal, amber, red), so a state badge cannot be read as a budget verdict, and each state
// group has a mark of its own shape besides its colour (WCAG 2.2 success criterion 1.4.1, use of
// colour: colour is not the only visual means of conveying information).
import { render } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { RUN_STATE_LABELS } from '../../../shared/schemas/pipeline';
import type { RunStateName } from '../../../shared/schemas/pipeline';
import { RELEASE_STATE_LABELS } from '../../../shared/schemas/release';
import type { ReleaseState } from '../../../shared/schemas/release';
import { RunStateBadge } from '../../../src/components/charts/run-badges';
import { ReleaseStateBadge } from '../../../src/components/releases/release-badge';

const USE_SCALE = /\b(?:bg|text|border)-(?:tealdeep|signal|stop)-/;

function badges() {
  const out: HTMLElement[] = [];
  for (const state of Object.keys(RUN_STATE_LABELS) as RunStateName[]) {
    const { container } = render(<RunStateBadge state={state} />);
    out.push(container.firstElementChild as HTMLElement);
  }
  for (const state of Object.keys(RELEASE_STATE_LABELS) as ReleaseState[]) {
    const { container } = render(<ReleaseStateBadge state={state} />);
    out.push(container.firstElementChild as HTMLElement);
  }
  return out;
}

describe('state badges', () => {
  it('use none of the use scale’s colours', () => {
    for (const badge of badges()) {
      const classes = [badge, ...badge.querySelectorAll('*')].map((el) => el.getAttribute('class') ?? '');
      expect(classes.join(' '), badge.dataset.state).not.toMatch(USE_SCALE);
    }
  });

  it('give every state group a mark of its own shape and say the state in words', () => {
    const markByGroup = new Map<string, string>();
    for (const badge of badges()) {
      const group = badge.dataset.stateGroup as string;
      const mark = badge.querySelector('[aria-hidden="true"]')?.getAttribute('class') ?? '';
      expect(mark, group).not.toBe('');
      const seen = markByGroup.get(group);
      if (seen) expect(mark).toBe(seen);
      else markByGroup.set(group, mark);
      expect(badge.textContent?.trim().length).toBeGreaterThan(0);
    }
    expect(new Set(markByGroup.values()).size).toBe(markByGroup.size);
    expect([...markByGroup.keys()].sort()).toEqual(['broken', 'decide', 'done', 'retired', 'waiting']);
  });
});
