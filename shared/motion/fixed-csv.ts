// Fixed-point CSV text of columns of numbers, the same characters Number.prototype.toFixed gives,
// written as ASCII bytes and decoded once per block of rows instead of building a string per number.
//
// Why it is exact: toFixed(f) prints the integer n nearest to x * 10^f (ECMAScript, Number.prototype.
// toFixed, step 10; the larger n on a tie). With |x * 10^f| below 2^33 the computed product is within
// half an ulp, at most 2^-21, of the exact one, so rounding the computed product gives the same n
// unless its fraction lies within 1e-6 of one half; those few values, and anything at or above 2^33,
// NaN and the infinities, are printed by toFixed itself.

const LIMIT = 2 ** 33;
const ROWS_PER_BLOCK = 4096;
// toFixed never prints more than 21 digits, a sign, a point and 20 decimals (or an exponent form of
// fewer characters); the block buffer makes room for that per field.
const MAX_FIELD = 44;

/** Writes v.toFixed(digits) as ASCII at bytes[at]; returns the index after it. pow = 10^digits. */
export function writeFixed(bytes: Uint8Array, at: number, v: number, digits: number, pow: number): number {
  const p = v * pow;
  const a = p < 0 ? -p : p;
  const whole = Math.floor(a);
  const frac = a - whole;
  if (!(a < LIMIT) || (frac > 0.499999 && frac < 0.500001)) {
    const text = v.toFixed(digits);
    for (let i = 0; i < text.length; i++) bytes[at++] = text.charCodeAt(i);
    return at;
  }
  const n = frac >= 0.5 ? whole + 1 : whole;
  if (v < 0) bytes[at++] = 45; // '-', as toFixed writes for a negative x that rounds to 0
  const ip = Math.floor(n / pow);
  const fp = n - ip * pow;
  // The digits by 32-bit integer arithmetic where the parts fit ((t / 10) | 0 is floor(t / 10) for
  // 0 <= t < 2^31, and a small integer stores into the bytes without a double's conversion).
  if (ip < 2147483648) {
    let t = ip | 0;
    let len = 1;
    for (let p10 = 10; p10 <= t && len < 10; p10 *= 10) len++;
    let e = at + len;
    do {
      const q = (t / 10) | 0;
      bytes[--e] = (48 + t - q * 10) | 0;
      t = q;
    } while (t > 0);
    at += len;
  } else {
    let len = 0;
    for (let t = ip; t > 0; t = Math.floor(t / 10)) len++;
    let e = at + len;
    for (let t = ip; t > 0;) {
      const q = Math.floor(t / 10);
      bytes[--e] = 48 + (t - q * 10);
      t = q;
    }
    at += len;
  }
  if (digits === 0) return at;
  bytes[at++] = 46; // '.'
  if (digits <= 9) {
    let f = fp | 0;
    for (let k = digits - 1; k >= 0; k--) {
      const q = (f / 10) | 0;
      bytes[at + k] = (48 + f - q * 10) | 0;
      f = q;
    }
  } else {
    let f = fp;
    for (let k = digits - 1; k >= 0; k--) {
      const q = Math.floor(f / 10);
      bytes[at + k] = 48 + (f - q * 10);
      f = q;
    }
  }
  return at + digits;
}

/**
 * CSV text: the header line, then per row the time with `timeDigits` decimals and each column with
 * `digits` decimals, as toFixed prints them, except that a value printing as minus zero is written as
 * plain zero. Lines end in '\n'.
 */
export function fixedColumnsCsv(
  header: string,
  time_s: Float64Array,
  cols: readonly Float64Array[],
  timeDigits: number,
  digits: number,
): string {
  const decoder = new TextDecoder('latin1');
  const parts: string[] = [`${header}\n`];
  writeBlocks(time_s, cols, timeDigits, digits, (block) => parts.push(decoder.decode(block)));
  return parts.join('');
}

/**
 * fixedColumnsCsv as ASCII bytes, in pieces of a few hundred kilobytes (header first): the same
 * characters, without a string of the whole file.
 */
export function fixedColumnsCsvBytes(
  header: string,
  time_s: Float64Array,
  cols: readonly Float64Array[],
  timeDigits: number,
  digits: number,
): Uint8Array[] {
  const head = `${header}\n`;
  const first = new Uint8Array(head.length);
  for (let i = 0; i < head.length; i++) first[i] = head.charCodeAt(i) & 0xff;
  const parts: Uint8Array[] = [first];
  writeBlocks(time_s, cols, timeDigits, digits, (block) => parts.push(block.slice()));
  return parts;
}

/** The rows of fixedColumnsCsv, block by block, into `emit` (the block's bytes, reused after the call). */
function writeBlocks(
  time_s: Float64Array,
  cols: readonly Float64Array[],
  timeDigits: number,
  digits: number,
  emit: (block: Uint8Array) => void,
): void {
  const n = time_s.length;
  const m = cols.length;
  const tPow = 10 ** timeDigits;
  const pow = 10 ** digits;
  const bytes = new Uint8Array(Math.min(n, ROWS_PER_BLOCK) * (m + 1) * MAX_FIELD + 1);
  for (let start = 0; start < n; start += ROWS_PER_BLOCK) {
    const end = Math.min(n, start + ROWS_PER_BLOCK);
    let at = 0;
    for (let i = start; i < end; i++) {
      at = writeFixed(bytes, at, time_s[i] as number, timeDigits, tPow);
      for (let c = 0; c < m; c++) {
        bytes[at++] = 44; // ','
        const from = at;
        at = writeFixed(bytes, at, (cols[c] as Float64Array)[i] as number, digits, pow);
        // "-0.000..." (a tiny negative value) is written as plain zero.
        if (bytes[from] === 45 && isZeroText(bytes, from + 1, at)) {
          bytes.copyWithin(from, from + 1, at);
          at--;
        }
      }
      bytes[at++] = 10; // '\n'
    }
    emit(bytes.subarray(0, at));
  }
}

/** True when bytes[from, to) are only '0' and '.' characters. */
function isZeroText(bytes: Uint8Array, from: number, to: number): boolean {
  for (let i = from; i < to; i++) {
    const b = bytes[i];
    if (b !== 48 && b !== 46) return false;
  }
  return true;
}
