// Which runs the comparison page takes: the track page's run list and the comparison itself ask the
// same rule, so the action is offered exactly when the page can show the runs side by side.

/** Most runs the page compares at once (each needs its own colour and dash). */
export const COMPARE_MAX_RUNS = 4;

export interface SelectableRun {
  id: string;
  takeId: string;
  takeNumber: number;
  state: string;
}

/** Whether the selected runs can be compared, and when not, why (shown beside the disabled action). */
export function compareSelection(selected: readonly SelectableRun[]): { ok: boolean; reason: string } {
  if (selected.length < 2) {
    return {
      ok: false,
      reason:
        selected.length === 0
          ? 'Select two or more runs of one take to compare them.'
          : 'Select at least one more run of the same take.',
    };
  }
  if (selected.length > COMPARE_MAX_RUNS)
    return { ok: false, reason: `Compare at most ${COMPARE_MAX_RUNS} runs at once.` };
  const takes = [...new Set(selected.map((r) => r.takeNumber))].sort((a, b) => a - b);
  if (new Set(selected.map((r) => r.takeId)).size > 1)
    return {
      ok: false,
      reason: `The selected runs are of different takes (${takes.join(', ')}); compare runs of one take.`,
    };
  const unfinished = selected.filter(
    (r) => r.state === 'queued' || r.state === 'cueing' || r.state === 'failed',
  );
  if (unfinished.length > 0)
    return {
      ok: false,
      reason: 'A selected run has no result (queued, cueing or failed); compare finished runs.',
    };
  return { ok: true, reason: `Compare ${selected.length} runs of take ${takes[0]}.` };
}
