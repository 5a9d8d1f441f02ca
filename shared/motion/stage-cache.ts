// Memoised stages of a computation that is run again and again with small changes (the profile
// editor's preview): each stage keeps its last inputs and value, and is computed again only when an
// input differs. Numbers and strings count by value (-0 apart from 0, as Object.is); an array counts as
// the same input when it is the same object and has not been written since (a stage computed again
// may write its new value into its previous arrays, which marks them as changed), so a stage fed by a
// reused stage is reused in turn.

/** What a stage is computed from. */
export type StageInput = Float64Array | number | string | boolean;

interface Entry {
  inputs: readonly StageInput[];
  versions: readonly number[];
  value: unknown;
}

export class StageCache {
  private readonly stages = new Map<string, Entry>();
  private readonly versions = new WeakMap<Float64Array, number>();
  private readonly buffers = new Map<string, Float64Array>();
  private written = 0;
  /** Stages computed and reused since the counts were last reset. */
  computed = 0;
  reused = 0;

  private versionOf(v: StageInput): number {
    return v instanceof Float64Array ? (this.versions.get(v) ?? 0) : 0;
  }

  /** Marks the arrays of a stage's value (the value itself, or its properties) as newly written. */
  private markWritten(value: unknown): void {
    if (value instanceof Float64Array) {
      this.versions.set(value, ++this.written);
    } else if (value && typeof value === 'object') {
      for (const v of Object.values(value))
        if (v instanceof Float64Array) this.versions.set(v, ++this.written);
    }
  }

  /**
   * The stage's value for these inputs: the stored one when every input is the same as last time, else
   * compute(previous)'s, stored for next time. compute may write the new value into the arrays of
   * `previous` (the stage's last value) rather than allocate new ones. A value is valid until its stage
   * is computed again: read it, never write into it, and do not keep it past the next run.
   */
  stage<T>(name: string, inputs: readonly StageInput[], compute: (previous: T | undefined) => T): T {
    const hit = this.stages.get(name);
    if (
      hit &&
      hit.inputs.length === inputs.length &&
      hit.inputs.every((v, i) => Object.is(v, inputs[i]) && hit.versions[i] === this.versionOf(v))
    ) {
      this.reused++;
      return hit.value as T;
    }
    const value = compute(hit?.value as T | undefined);
    this.markWritten(value);
    this.stages.set(name, { inputs, versions: inputs.map((v) => this.versionOf(v)), value });
    this.computed++;
    return value;
  }

  /** A scratch array of n samples kept under `name` for the next run (its contents are overwritten). */
  buffer(name: string, n: number): Float64Array {
    let b = this.buffers.get(name);
    if (!b || b.length !== n) {
      b = new Float64Array(n);
      this.buffers.set(name, b);
    }
    return b;
  }

  resetCounts(): void {
    this.computed = 0;
    this.reused = 0;
  }
}

/** The same interface without memory: every stage is computed, every buffer new. */
export const NO_STAGE_CACHE: Pick<StageCache, 'stage' | 'buffer'> = {
  stage<T>(_name: string, _inputs: readonly StageInput[], compute: (previous: T | undefined) => T): T {
    return compute(undefined);
  },
  buffer(_name: string, n: number): Float64Array {
    return new Float64Array(n);
  },
};

/** `previous` when it holds n samples, else a new array of n. */
export function reuseArray(previous: Float64Array | undefined, n: number): Float64Array {
  return previous && previous.length === n ? previous : new Float64Array(n);
}

/** A section of plain numbers (a profile's part) as one stage input; -0 is kept apart from 0. */
export const sectionKey = (section: object): string =>
  JSON.stringify(section, (_k, v: unknown) => (Object.is(v, -0) ? '-0' : v));
