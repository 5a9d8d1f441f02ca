// Time derivatives of sampled columns on a possibly uneven grid.

/**
 * d(values)/dt into `out` (units of values per second): the three-point formula for uneven spacing in
 * the interior (exact for quadratics), one-sided three-point formulas at both ends, a plain
 * difference for two samples and zero for one.
 */
export function derivativeInto(time_s: Float64Array, values: Float64Array, out: Float64Array): Float64Array {
  const n = time_s.length;
  if (values.length < n || out.length < n) throw new RangeError('derivative: arrays shorter than time');
  if (n === 1) {
    out[0] = 0;
    return out;
  }
  if (n === 2) {
    const d =
      ((values[1] as number) - (values[0] as number)) / ((time_s[1] as number) - (time_s[0] as number));
    out[0] = d;
    out[1] = d;
    return out;
  }
  for (let i = 1; i < n - 1; i++) {
    const h1 = (time_s[i] as number) - (time_s[i - 1] as number);
    const h2 = (time_s[i + 1] as number) - (time_s[i] as number);
    const y0 = values[i - 1] as number;
    const y1 = values[i] as number;
    const y2 = values[i + 1] as number;
    out[i] = (-h2 / (h1 * (h1 + h2))) * y0 + ((h2 - h1) / (h1 * h2)) * y1 + (h1 / (h2 * (h1 + h2))) * y2;
  }
  // Ends: derivative of the quadratic through the first (last) three samples, evaluated at the end.
  {
    const h1 = (time_s[1] as number) - (time_s[0] as number);
    const h2 = (time_s[2] as number) - (time_s[1] as number);
    const y0 = values[0] as number;
    const y1 = values[1] as number;
    const y2 = values[2] as number;
    out[0] =
      (-(2 * h1 + h2) / (h1 * (h1 + h2))) * y0 + ((h1 + h2) / (h1 * h2)) * y1 - (h1 / (h2 * (h1 + h2))) * y2;
  }
  {
    const h1 = (time_s[n - 2] as number) - (time_s[n - 3] as number);
    const h2 = (time_s[n - 1] as number) - (time_s[n - 2] as number);
    const y0 = values[n - 3] as number;
    const y1 = values[n - 2] as number;
    const y2 = values[n - 1] as number;
    out[n - 1] =
      (h2 / (h1 * (h1 + h2))) * y0 - ((h1 + h2) / (h1 * h2)) * y1 + ((h1 + 2 * h2) / (h2 * (h1 + h2))) * y2;
  }
  return out;
}

/** d(values)/dt as a new array (units of values per second); see derivativeInto. */
export function derivative(time_s: Float64Array, values: Float64Array): Float64Array {
  return derivativeInto(time_s, values, new Float64Array(time_s.length));
}
