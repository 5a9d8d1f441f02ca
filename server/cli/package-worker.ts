// A second thread for `legwork process`: while the main thread runs the checks and spectra, a worker
// turns the finished motion (times, pose, legs, seat forces) into the bytes of legs.csv, pose.csv and
// seat_force.csv, with the same functions (shared/motion/run-outputs.ts) the main thread would call,
// so the package is the same byte for byte. The worker runs the compiled command's own bundle; from
// sources (tsx), or with LEGWORK_THREADS=0, or when a worker cannot start, everything stays on the
// main thread (LEGWORK_THREADS=1 makes a worker's failure an error instead).
import { Worker, isMainThread, parentPort, workerData } from 'node:worker_threads';
import type { PoseColumns } from '../../shared/motion/hexapod';
import type { ProcessResult } from '../../shared/motion/process';
import { legsCsv, poseCsv, seatForceCsv } from '../../shared/motion/run-outputs';
import type { PackageFileName } from '../../shared/schemas/run-outputs';

const ROLE = 'legwork-package-csv';

/** The motion the worker writes as CSV. */
export type MotionForCsv = Pick<ProcessResult, 'time_s' | 'pose' | 'legs' | 'seatForce_mps2' | 'baseKind'>;

/** The CSV files' bytes, by package file name. */
export type CsvBytes = Partial<Record<PackageFileName, Uint8Array>>;

const encoder = new TextEncoder();

/** The bytes of the motion's CSV files (the same text buildRunOutputs makes, as UTF-8). */
export function motionCsvBytes(m: MotionForCsv): CsvBytes {
  return {
    'legs.csv': encoder.encode(legsCsv(m)),
    'pose.csv': encoder.encode(poseCsv(m)),
    'seat_force.csv': encoder.encode(seatForceCsv(m)),
  };
}

interface CsvRequest {
  time_s: Float64Array;
  pose: PoseColumns;
  legs: Float64Array[];
  seatForce_mps2: [Float64Array, Float64Array, Float64Array][];
  baseKind: ProcessResult['baseKind'];
}

type CsvReply = { ok: true; files: CsvBytes } | { ok: false; error: string };

/** A started worker: `write(motion)` once, then `result()` for the bytes. */
export interface PackageWorker {
  write(m: MotionForCsv): void;
  /** The CSV bytes; rejects if the worker failed (the caller then builds them itself). */
  result(): Promise<CsvBytes>;
  /** Ends the worker (after result(), or when the run stops early). */
  close(): void;
}

/**
 * Starts the worker when the command runs from its compiled bundle (`moduleUrl`, the bundle's
 * import.meta.url, ends in .mjs) and threads are not turned off; else null.
 */
export function startPackageWorker(moduleUrl: string): PackageWorker | null {
  if (process.env.LEGWORK_THREADS === '0' || !moduleUrl.endsWith('.mjs')) return null;
  let worker: Worker;
  try {
    worker = new Worker(new URL(moduleUrl), { workerData: { role: ROLE } });
  } catch {
    return null;
  }
  worker.unref();
  let settle: ((r: CsvReply) => void) | undefined;
  const reply = new Promise<CsvReply>((resolve) => {
    settle = resolve;
  });
  worker.once('message', (r: CsvReply) => settle?.(r));
  worker.once('error', (e) => settle?.({ ok: false, error: e.message }));
  worker.once('exit', (code) => settle?.({ ok: false, error: `worker exited with code ${code}` }));
  let sent = false;
  return {
    write(m) {
      sent = true;
      const req: CsvRequest = {
        time_s: m.time_s,
        pose: m.pose,
        legs: m.legs,
        seatForce_mps2: m.seatForce_mps2.map((f) => [f[0], f[1], f[2]]),
        baseKind: m.baseKind,
      };
      worker.postMessage(req);
    },
    async result() {
      if (!sent) throw new Error('no motion was sent to the worker');
      const r = await reply;
      if (!r.ok) throw new Error(r.error);
      return r.files;
    },
    close() {
      void worker.terminate();
    },
  };
}

/** In a worker started by startPackageWorker: answers the one request. Returns whether it is one. */
export function runPackageWorkerIfAsked(): boolean {
  if (isMainThread || !parentPort || (workerData as { role?: string } | null)?.role !== ROLE) return false;
  const port = parentPort;
  port.once('message', (req: CsvRequest) => {
    let reply: CsvReply;
    try {
      reply = { ok: true, files: motionCsvBytes(req) };
    } catch (e) {
      reply = { ok: false, error: e instanceof Error ? e.message : String(e) };
    }
    const transfer = reply.ok
      ? Object.values(reply.files).map((b) => (b as Uint8Array).buffer as ArrayBuffer)
      : [];
    port.postMessage(reply, transfer);
  });
  return true;
}
