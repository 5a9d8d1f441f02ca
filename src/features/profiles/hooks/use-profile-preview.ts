// Drives the profile preview's two Web Workers (profile-preview.worker.ts): one for the motion, one for
// the budget's full checks. Each change of the inputs gets a new generation number; the checks are
// debounced (the motion is asked for at once) and an answer for any generation but the
// newest is dropped, so a stale computation never overwrites a newer one.
import { useEffect, useRef, useState } from 'react';
import type { Budget } from '../../../../shared/schemas/budget';
import type { ControllerOutput } from '../../../../shared/schemas/controller-output';
import type { CueingProfile } from '../../../../shared/schemas/cueing-profile';
import type { MotionBase } from '../../../../shared/schemas/motion-base';
import type { PreviewChecks, PreviewOutput } from '../../../../shared/motion/preview';
import type { Track } from '../../../../shared/motion/track-reader';
import type { PreviewAnswer, PreviewRequest } from './profile-preview.worker';

/**
 * Waits before a change is computed (ms). The motion is asked for at once: it takes well under the
 * 100 ms a change may take to show, and the worker computes only the newest of the requests that
 * arrived while it was busy, so fast typing costs no more than one computation behind. The slower
 * checks wait until typing pauses.
 */
export const MOTION_DEBOUNCE_MS = 0;
export const CHECKS_DEBOUNCE_MS = 600;

export interface PreviewInputs {
  /** Names the take's data (which take, from which source); a new key loads the take again. */
  takeKey: string | null;
  track: Track | null;
  base: MotionBase | null;
  ramp: ControllerOutput['ramp'] | null;
  budget: Budget | null;
  /** The profile being edited, or null while it has problems (the preview then keeps the last one). */
  profile: CueingProfile | null;
}

export interface PreviewState {
  motion: PreviewOutput | null;
  /** The generation the motion shown was computed for, and how long the worker took (ms). */
  motionGeneration: number;
  motionMs: number | null;
  checks: PreviewChecks | null;
  checksMs: number | null;
  /** True while a newer motion or check than the one shown is being computed. */
  motionBusy: boolean;
  checksBusy: boolean;
  error: string | null;
  checksError: string | null;
  /** The newest generation asked for. */
  generation: number;
}

const EMPTY: PreviewState = {
  motion: null,
  motionGeneration: 0,
  motionMs: null,
  checks: null,
  checksMs: null,
  motionBusy: false,
  checksBusy: false,
  error: null,
  checksError: null,
  generation: 0,
};

function startWorker(): Worker {
  return new Worker(new URL('./profile-preview.worker.ts', import.meta.url), { type: 'module' });
}

export function useProfilePreview(inputs: PreviewInputs): PreviewState {
  const [state, setState] = useState<PreviewState>(EMPTY);
  const workers = useRef<{ motion: Worker; checks: Worker } | null>(null);
  const generation = useRef(0);
  const loadedKey = useRef<string | null>(null);

  useEffect(() => {
    const motion = startWorker();
    const checks = startWorker();
    const onAnswer = (event: MessageEvent<PreviewAnswer>) => {
      const a = event.data;
      if (a.generation !== generation.current) return; // stale: a newer request is on its way
      setState((s) => {
        if (a.type === 'motion')
          return {
            ...s,
            motion: a.output,
            motionGeneration: a.generation,
            motionMs: a.elapsed_ms,
            motionBusy: false,
            error: null,
          };
        if (a.type === 'checks')
          return { ...s, checks: a.checks, checksMs: a.elapsed_ms, checksBusy: false, checksError: null };
        return a.what === 'motion'
          ? { ...s, motionBusy: false, error: a.message }
          : { ...s, checksBusy: false, checks: null, checksError: a.message };
      });
    };
    motion.onmessage = onAnswer;
    checks.onmessage = onAnswer;
    workers.current = { motion, checks };
    return () => {
      motion.terminate();
      checks.terminate();
      workers.current = null;
      loadedKey.current = null;
    };
  }, []);

  const { takeKey, track, base, ramp, budget, profile } = inputs;
  useEffect(() => {
    const w = workers.current;
    if (!w || !takeKey || !track || !base || !profile) return;
    if (loadedKey.current !== takeKey) {
      const msg: PreviewRequest = { type: 'take', key: takeKey, track };
      w.motion.postMessage(msg);
      w.checks.postMessage(msg);
      loadedKey.current = takeKey;
    }
    const gen = ++generation.current;
    setState((s) => ({ ...s, generation: gen, motionBusy: true, checksBusy: budget !== null }));
    const request = (what: 'motion' | 'checks'): PreviewRequest => ({
      type: 'compute',
      what,
      generation: gen,
      key: takeKey,
      base,
      profile,
      budget,
      ramp,
    });
    const m = setTimeout(() => w.motion.postMessage(request('motion')), MOTION_DEBOUNCE_MS);
    const c = budget ? setTimeout(() => w.checks.postMessage(request('checks')), CHECKS_DEBOUNCE_MS) : null;
    return () => {
      clearTimeout(m);
      if (c) clearTimeout(c);
    };
  }, [takeKey, track, base, ramp, budget, profile]);

  return state;
}
