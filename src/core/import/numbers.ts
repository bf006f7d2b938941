// Number parsing on the import hot path. Number() is V8's own fast decimal parser; the slow path
// (trim, lower case, a set lookup) runs only for fields that are not plain numbers.

const MISSING = new Set(['', 'na', 'n/a', 'nan', 'null', 'none', '-', '--']);

function isBlank(text: string): boolean {
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c !== 32 && c !== 9 && c !== 13) return false;
  }
  return true;
}

/** Parses one measurement field: a number, NaN for an accepted missing marker, undefined if bad. */
export function parseValue(field: string): number | undefined {
  const v = +field;
  if (v === v) {
    // Number('') and Number('  ') are 0: an empty field is a missing value, not zero.
    if (v === 0 && isBlank(field)) return NaN;
    // Number() also reads hexadecimal and binary literals, which no tester writes for a reading.
    if (field.length > 1 && (field.charCodeAt(1) | 32) > 97 && /0[xob]/i.test(field)) return undefined;
    return v;
  }
  const t = field.trim().toLowerCase();
  return MISSING.has(t) ? NaN : undefined;
}

/** Parses a die coordinate or site: an integer, or undefined. */
export function parseInteger(field: string): number | undefined {
  const v = +field;
  if (!Number.isInteger(v) || (v === 0 && isBlank(field))) return undefined;
  return v;
}
