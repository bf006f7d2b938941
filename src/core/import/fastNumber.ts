// Decimal numbers read straight from bytes, without making a string: the import's hot path.
// Exact by construction (Clinger's fast path, "How to read floating point numbers accurately",
// PLDI 1990): when the digits as an integer m stay below 2^53, m is an exact double, and 10^k for
// k <= 22 is exact too, so m * 10^k or m / 10^k is one correctly rounded operation and equals
// what Number() gives for the same text. Anything else returns NaN and the caller takes the
// string path, so no value is ever read differently from Number().

const POW10 = Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));

/** Where the last scanField call stopped: the delimiter after the field, or end. */
export let scanEnd = 0;

/** Index of the next delimiter, line feed or quote at or after start, or end; sets scanEnd too. */
export function scanField(buf: Uint8Array, start: number, end: number, delimiter: number): number {
  let i = start;
  while (i < end) {
    const c = buf[i];
    if (c === delimiter || c === 10 || c === 34) break;
    i++;
  }
  scanEnd = i;
  return i;
}

/**
 * The number written in buf[start, end) (surrounding spaces allowed), or NaN when it is not plain
 * decimal: the field form of scanNumber, which does the reading.
 */
export function fastNumber(buf: Uint8Array, start: number, end: number): number {
  let i = start;
  while (i < end && (buf[i] === 32 || buf[i] === 9)) i++;
  while (end > i && (buf[end - 1] === 32 || buf[end - 1] === 9 || buf[end - 1] === 13)) end--;
  if (i === end) return NaN;
  const v = scanNumber(buf, i, end, -1);
  return scanEnd === end ? v : NaN;
}

/** A whole number in buf[start, end) (spaces allowed), or NaN. */
export function fastInteger(buf: Uint8Array, start: number, end: number): number {
  let i = start;
  while (i < end && (buf[i] === 32 || buf[i] === 9)) i++;
  while (end > i && (buf[end - 1] === 32 || buf[end - 1] === 9 || buf[end - 1] === 13)) end--;
  if (i === end) return NaN;
  let negative = false;
  if (buf[i] === 45) { negative = true; i++; } else if (buf[i] === 43) i++;
  if (i === end || end - i > 9) return NaN;
  let v = 0;
  for (; i < end; i++) {
    const c = buf[i] - 48;
    if (c < 0 || c > 9) return NaN;
    v = v * 10 + c;
  }
  return negative ? -v : v;
}

/** UTF-8 bytes to text (lot and wafer names); src/core has no TextDecoder. Bad sequences become U+FFFD. */
export function decodeUtf8(buf: Uint8Array, start: number, end: number): string {
  let out = '';
  let i = start;
  while (i < end) {
    const b = buf[i];
    if (b < 0x80) { out += String.fromCharCode(b); i++; continue; }
    let cp = 0xfffd;
    let len = 1;
    if (b >= 0xc2 && b < 0xe0 && i + 1 < end && (buf[i + 1] & 0xc0) === 0x80) { cp = ((b & 0x1f) << 6) | (buf[i + 1] & 0x3f); len = 2; }
    else if (b >= 0xe0 && b < 0xf0 && i + 2 < end && (buf[i + 1] & 0xc0) === 0x80 && (buf[i + 2] & 0xc0) === 0x80) {
      cp = ((b & 0x0f) << 12) | ((buf[i + 1] & 0x3f) << 6) | (buf[i + 2] & 0x3f); len = 3;
      if (cp < 0x800 || (cp >= 0xd800 && cp <= 0xdfff)) cp = 0xfffd;
    } else if (b >= 0xf0 && b < 0xf5 && i + 3 < end && (buf[i + 1] & 0xc0) === 0x80 && (buf[i + 2] & 0xc0) === 0x80 && (buf[i + 3] & 0xc0) === 0x80) {
      cp = ((b & 0x07) << 18) | ((buf[i + 1] & 0x3f) << 12) | ((buf[i + 2] & 0x3f) << 6) | (buf[i + 3] & 0x3f); len = 4;
      if (cp < 0x10000 || cp > 0x10ffff) cp = 0xfffd;
    }
    out += String.fromCodePoint(cp);
    i += len;
  }
  return out;
}

/**
 * Reads a plain decimal number starting at buf[start] and ending at the delimiter, a line feed
 * (a CR before it is allowed) or limit, in the same pass that finds the field's end (left in
 * scanEnd). Returns NaN for anything else (spaces, words, too many digits): the caller then takes
 * the string path. Same exactness argument as fastNumber.
 */
export function scanNumber(buf: Uint8Array, start: number, limit: number, delimiter: number): number {
  let i = start;
  let negative = false;
  if (i < limit) {
    const c = buf[i];
    if (c === 45) { negative = true; i++; } else if (c === 43) i++;
  }
  let m = 0;
  let exp = 0;
  const intStart = i;
  while (i < limit) {
    const d = buf[i] - 48;
    if (d < 0 || d > 9) break;
    m = m * 10 + d;
    i++;
  }
  let digits = i - intStart;
  if (i < limit && buf[i] === 46) {
    i++;
    const fractionStart = i;
    while (i < limit) {
      const d = buf[i] - 48;
      if (d < 0 || d > 9) break;
      m = m * 10 + d;
      i++;
    }
    exp = fractionStart - i;
    digits -= exp;
  }
  // m grows monotonically, so it stayed exact all the way exactly when it ends below 2^53.
  if (digits === 0 || m >= 9007199254740992) return NaN;
  if (i < limit && (buf[i] | 32) === 101) {
    i++;
    let expNegative = false;
    if (i < limit && (buf[i] === 45 || buf[i] === 43)) { expNegative = buf[i] === 45; i++; }
    let e = 0;
    let expDigits = 0;
    while (i < limit) {
      const d = buf[i] - 48;
      if (d < 0 || d > 9) break;
      if (e < 10_000) e = e * 10 + d;
      expDigits++;
      i++;
    }
    if (expDigits === 0) return NaN;
    exp += expNegative ? -e : e;
  }
  if (i < limit) {
    const c = buf[i];
    if (c === 13) {
      i++;
      if (i < limit && buf[i] !== 10) return NaN;
    } else if (c !== delimiter && c !== 10) return NaN;
  }
  scanEnd = i;
  let v: number;
  if (m === 0) v = 0;
  else if (exp === 0) v = m;
  else if (exp > 0 && exp <= 22) v = m * POW10[exp];
  else if (exp < 0 && exp >= -22) v = m / POW10[-exp];
  else return NaN;
  return negative ? -v : v;
}
