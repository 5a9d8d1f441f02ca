// A second thread for `legwork process`, doing parts of the run with the same functions the main
// thread would call, so the package is the same byte for byte:
// - while the main thread resamples the first half of the track's columns, the worker resamples the
//   other half (shared/motion/resample.ts, resampleAntiAliasColumns);
// - while the main thread runs the checks and spectra, the worker turns the finished motion (times,
//   pose, legs, seat forces) into the bytes of legs.csv, pose.csv and seat_force.csv
//   (shared/motion/run-outputs.ts, motionCsvParts).
// Off unless LEGWORK_THREADS=1: on a two-core machine shared with other work, the worker's own
// start-up (it loads the command's bundle again) cost more CPU time than it saved, and the command
// was no faster (bench section legwork-vs-plain run with and without it). With LEGWORK_THREADS=1 and the compiled
// bundle (not from sources through tsx), the worker is used, and its failure is an error.
import { Worker, isMainThread, parentPort, workerData } from 'node:worker_threads';
import type { DecimatedColumn } from '../../shared/motion/band-limit';
import type { PoseColumns } from '../../shared/motion/hexapod';
import type { ProcessResult } from '../../shared/motion/process';
import { resampleAntiAliasColumns } from '../../shared/motion/resample';
import { motionCsvParts } from '../../shared/motion/run-outputs';
import type { Track } from '../../shared/motion/track-reader';
import type { PackageFileName } from '../../shared/schemas/run-outputs';

const ROLE = 'legwork-package-worker';

/** The motion the worker writes as CSV. */
export type MotionForCsv = Pick<ProcessResult, 'time_s' | 'pose' | 'legs' | 'seatForce_mps2' | 'baseKind'>;

/** The CSV files' bytes in pieces, by package file name. */
export type CsvBytes = Partial<Record<PackageFileName, Uint8Array[]>>;

type Request =
  | {
      id: number;
      kind: 'resample';
      time_s: Float64Array;
      trackKind: Track['kind'];
      columns: Map<number, Float64Array>;
      rate_hz: number;
    }
  | {
      id: number;
      kind: 'csv';
      time_s: Float64Array;
      pose: PoseColumns;
      legs: Float64Array[];
      seatForce_mps2: [Float64Array, Float64Array, Float64Array][];
      baseKind: ProcessResult['baseKind'];
    };

type Reply = { id: number; ok: true; value: unknown } | { id: number; ok: false; error: string };

/** A started worker. Each call resolves to its answer, or rejects if the worker failed. */
export interface PackageWorker {
  /** resampleAntiAliasColumns of the given columns of a track. */
  resample(
    track: Pick<Track, 'time_s' | 'kind'>,
    columns: Map<number, Float64Array>,
    rate_hz: number,
  ): Promise<Map<number, DecimatedColumn>>;
  /** motionCsvParts of the motion (sent now; the promise is for the bytes). */
  csv(m: MotionForCsv): Promise<CsvBytes>;
  /** Ends the worker (when done, or when the run stops early). */
  close(): void;
}

/**
 * Starts the worker when LEGWORK_THREADS=1 and the command runs from its compiled bundle
 * (`moduleUrl`, the bundle's import.meta.url, ends in .mjs); else null.
 */
export function startPackageWorker(moduleUrl: string): PackageWorker | null {
  if (process.env.LEGWORK_THREADS !== '1' || !moduleUrl.endsWith('.mjs')) return null;
  let worker: Worker;
  try {
    worker = new Worker(new URL(moduleUrl), { workerData: { role: ROLE } });
  } catch {
    return null;
  }
  worker.unref();
  const waiting = new Map<number, { resolve: (v: unknown) => void; reject: (e: Error) => void }>();
  let failed: Error | null = null;
  const failAll = (e: Error) => {
    failed ??= e;
    for (const w of waiting.values()) w.reject(failed);
    waiting.clear();
  };
  worker.on('message', (r: Reply) => {
    const w = waiting.get(r.id);
    if (!w) return;
    waiting.delete(r.id);
    if (r.ok) w.resolve(r.value);
    else w.reject(new Error(r.error));
  });
  worker.once('error', (e) => failAll(e));
  worker.once('exit', (code) => failAll(new Error(`worker exited with code ${code}`)));
  let next = 0;
  const ask = <T>(req: Request): Promise<T> =>
    new Promise<T>((resolve, reject) => {
      if (failed) {
        reject(failed);
        return;
      }
      waiting.set(req.id, { resolve: resolve as (v: unknown) => void, reject });
      worker.postMessage(req);
    });
  return {
    resample(track, columns, rate_hz) {
      return ask({
        id: next++,
        kind: 'resample',
        time_s: track.time_s,
        trackKind: track.kind,
        columns,
        rate_hz,
      });
    },
    csv(m) {
      return ask({
        id: next++,
        kind: 'csv',
        time_s: m.time_s,
        pose: m.pose,
        legs: m.legs,
        seatForce_mps2: m.seatForce_mps2.map((f) => [f[0], f[1], f[2]]),
        baseKind: m.baseKind,
      });
    },
    close() {
      void worker.terminate();
    },
  };
}

function answer(req: Request): { value: unknown; transfer: ArrayBuffer[] } {
  if (req.kind === 'resample') {
    const value = resampleAntiAliasColumns(
      { time_s: req.time_s, kind: req.trackKind },
      req.columns,
      req.rate_hz,
    );
    return { value, transfer: [...value.values()].map((d) => d.values.buffer as ArrayBuffer) };
  }
  const value = motionCsvParts(req);
  return {
    value,
    transfer: Object.values(value).flatMap((parts) => parts.map((b) => b.buffer as ArrayBuffer)),
  };
}

/** In a worker started by startPackageWorker: answers its requests. Returns whether it is one. */
export function runPackageWorkerIfAsked(): boolean {
  if (isMainThread || !parentPort || (workerData as { role?: string } | null)?.role !== ROLE) return false;
  const port = parentPort;
  port.on('message', (req: Request) => {
    try {
      const { value, transfer } = answer(req);
      port.postMessage({ id: req.id, ok: true, value } satisfies Reply, transfer);
    } catch (e) {
      port.postMessage({
        id: req.id,
        ok: false,
        error: e instanceof Error ? e.message : String(e),
      } satisfies Reply);
    }
  });
  return true;
}
