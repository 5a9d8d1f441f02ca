// A full garbage collection on demand, for the command's few points where hundreds of megabytes of
// typed arrays were just let go (a long take's reader blocks once the columns are joined, the input
// columns once the run no longer needs them). V8 frees the memory behind typed arrays only when it
// collects, and with little else allocated it may not collect before the next large step allocates
// again, which is what sets the peak. Node exposes gc() on request (its --expose-gc flag, set here
// at run time).
import { setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';

let gc: (() => void) | null | undefined;

/** Collects garbage now, when the runtime allows it; else does nothing. */
export function collectGarbage(): void {
  if (gc === undefined) {
    try {
      setFlagsFromString('--expose-gc');
      const f: unknown = runInNewContext('gc');
      gc = typeof f === 'function' ? (f as () => void) : null;
    } catch {
      gc = null;
    }
  }
  gc?.();
}
