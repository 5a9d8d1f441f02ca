// The profile editor's preview, off the page's thread. One instance computes the motion
// (computeProfilePreview: washout, ramps, kinematics, seat force, chart bands), another the budget's
// full checks (previewChecks, i.e. processTrack); both run the shared motion code the worker process
// runs. The motion worker keeps the take prepared (resampled) and, with it, the stages of the last
// preview, so a change reruns only the stages it touches. Messages that arrive while a computation
// runs are coalesced: only the newest request is computed next, and every answer carries its
// request's generation so the page drops stale ones.
import type { Budget } from '../../../../shared/schemas/budget';
import type { ControllerOutput } from '../../../../shared/schemas/controller-output';
import type { CueingProfile } from '../../../../shared/schemas/cueing-profile';
import type { MotionBase } from '../../../../shared/schemas/motion-base';
import { computeProfilePreview, preparePreviewTake, previewChecks } from '../../../../shared/motion/preview';
import type { PreviewChecks, PreviewOutput, PreviewTake } from '../../../../shared/motion/preview';
import type { Track } from '../../../../shared/motion/track-reader';

export type PreviewRequest =
  | { type: 'take'; key: string; track: Track }
  | {
      type: 'compute';
      what: 'motion' | 'checks';
      generation: number;
      key: string;
      base: MotionBase;
      profile: CueingProfile;
      budget: Budget | null;
      ramp: ControllerOutput['ramp'] | null;
    };

export type PreviewAnswer =
  | { type: 'motion'; generation: number; output: PreviewOutput; elapsed_ms: number }
  | { type: 'checks'; generation: number; checks: PreviewChecks; elapsed_ms: number }
  | { type: 'error'; generation: number; what: 'motion' | 'checks'; message: string };

interface WorkerScope {
  onmessage: ((event: MessageEvent<PreviewRequest>) => void) | null;
  postMessage: (message: PreviewAnswer) => void;
}
const scope = self as unknown as WorkerScope;

let track: { key: string; track: Track } | null = null;
let prepared: { key: string; rate_hz: number; take: PreviewTake } | null = null;
let pending: Extract<PreviewRequest, { type: 'compute' }> | null = null;
let scheduled = false;

function compute(req: Extract<PreviewRequest, { type: 'compute' }>): void {
  const t0 = performance.now();
  try {
    if (!track || track.key !== req.key) throw new Error('the take is not loaded yet');
    const strokeMargin_m = req.budget?.strokeMargin_m ?? 0;
    const settings = {
      base: req.base,
      profile: req.profile,
      strokeMargin_m,
      ...(req.ramp ? { ramp: req.ramp } : {}),
    };
    if (req.what === 'motion') {
      const rate_hz = req.base.controllerRate_hz;
      if (!prepared || prepared.key !== req.key || prepared.rate_hz !== rate_hz) {
        prepared = { key: req.key, rate_hz, take: preparePreviewTake(track.track, rate_hz) };
      }
      const output = computeProfilePreview(prepared.take, settings);
      scope.postMessage({
        type: 'motion',
        generation: req.generation,
        output,
        elapsed_ms: performance.now() - t0,
      });
    } else {
      if (!req.budget) throw new Error('the venue has no budget profile, so nothing can be checked');
      const checks = previewChecks(track.track, { ...settings, budget: req.budget });
      scope.postMessage({
        type: 'checks',
        generation: req.generation,
        checks,
        elapsed_ms: performance.now() - t0,
      });
    }
  } catch (e) {
    scope.postMessage({
      type: 'error',
      generation: req.generation,
      what: req.what,
      message: e instanceof Error ? e.message : String(e),
    });
  }
}

function drain(): void {
  scheduled = false;
  const req = pending;
  pending = null;
  if (req) compute(req);
}

scope.onmessage = (event) => {
  const msg = event.data;
  if (msg.type === 'take') {
    track = { key: msg.key, track: msg.track };
    prepared = null;
    return;
  }
  pending = msg;
  if (!scheduled) {
    scheduled = true;
    setTimeout(drain, 0);
  }
};
