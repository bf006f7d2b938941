// Number formatting for the views: engineering notation with SI prefixes (pA, nA, uA, mA, mV,
// V ...), so a leakage of 1.23e-10 A reads "123 pA". Pure functions, no DOM.

/** Shown wherever a value is missing (NaN, undefined, null, infinite). */
export const MISSING_TEXT = '—';

/** SI prefixes by power of ten (SI Brochure, 9th ed., table 7). ASCII "u" stands for micro. */
const PREFIX_BY_EXPONENT = new Map<number, string>([
  [-18, 'a'], [-15, 'f'], [-12, 'p'], [-9, 'n'], [-6, 'u'], [-3, 'm'],
  [0, ''], [3, 'k'], [6, 'M'], [9, 'G'],
]);
const SMALLEST_EXPONENT = -18;
const LARGEST_EXPONENT = 9;

function isNumber(value: number | null | undefined): value is number {
  return value != null && Number.isFinite(value);
}

/**
 * Formats a value in engineering notation with `digits` significant digits and an SI prefix,
 * e.g. (1.234e-10, 'A') -> "123 pA", (0.45, 'V') -> "450 mV", (-2.5e-6, 'A') -> "-2.50 uA".
 * A unit of "" (unknown) gives a plain number. Missing values give MISSING_TEXT.
 */
export function formatEngineering(value: number | null | undefined, unit: string, digits = 3): string {
  if (!isNumber(value)) return MISSING_TEXT;
  if (unit === '') return formatPlain(value, digits + 1);
  if (value === 0) return `0 ${unit}`;
  const sign = value < 0 ? '-' : '';
  // toExponential rounds in decimal, so a carry (999.6 pA -> 1.00 nA) moves the exponent too.
  const [mantissaText, exponentText] = Math.abs(value).toExponential(digits - 1).split('e');
  const exponent = Number(exponentText);
  const significant = mantissaText.replace('.', '');
  const group = Math.floor(exponent / 3) * 3;
  if (group < SMALLEST_EXPONENT || group > LARGEST_EXPONENT) {
    return `${sign}${mantissaText}e${exponent} ${unit}`;
  }
  const integerDigits = exponent - group + 1;
  const padded = significant.padEnd(integerDigits, '0');
  const integerPart = padded.slice(0, integerDigits);
  const fraction = padded.slice(integerDigits);
  const number = fraction ? `${integerPart}.${fraction}` : integerPart;
  return `${sign}${number} ${PREFIX_BY_EXPONENT.get(group)}${unit}`;
}

/** A plain number with `digits` significant digits; exponent form outside 1e-4 .. 1e6. */
export function formatPlain(value: number | null | undefined, digits = 4): string {
  if (!isNumber(value)) return MISSING_TEXT;
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  if (magnitude < 1e-4 || magnitude >= 1e6) return value.toExponential(digits - 1);
  return String(Number(value.toPrecision(digits)));
}

/** A number with a fixed count of decimals, e.g. log10 values in decades: -10.23. */
export function formatFixed(value: number | null | undefined, decimals = 2): string {
  if (!isNumber(value)) return MISSING_TEXT;
  const text = value.toFixed(decimals);
  // "-0.00" says nothing a reader needs.
  return /^-0\.?0*$/.test(text) ? text.slice(1) : text;
}

/** An integer with thousands separators: 70000 -> "70,000". */
export function formatCount(value: number | null | undefined): string {
  if (!isNumber(value)) return MISSING_TEXT;
  const rounded = Math.round(value);
  const digits = String(Math.abs(rounded)).replace(/\B(?=(\d{3})+(?!\d))/g, ',');
  return rounded < 0 ? `-${digits}` : digits;
}

/** A duration in seconds, e.g. 0.42 -> "0.42 s", 75 -> "1 min 15 s". */
export function formatSeconds(seconds: number | null | undefined): string {
  if (!isNumber(seconds)) return MISSING_TEXT;
  if (seconds < 60) return `${Number(seconds.toPrecision(2))} s`;
  const minutes = Math.floor(seconds / 60);
  return `${minutes} min ${Math.round(seconds - minutes * 60)} s`;
}

/** A fraction as a percentage with one decimal: 0.123 -> "12.3 %". */
export function formatPercent(fraction: number | null | undefined): string {
  if (!isNumber(fraction)) return MISSING_TEXT;
  return `${formatFixed(fraction * 100, 1)} %`;
}

/** A byte count in binary multiples: 1536 -> "1.5 KiB". */
export function formatBytes(bytes: number | null | undefined): string {
  if (!isNumber(bytes)) return MISSING_TEXT;
  const units = ['B', 'KiB', 'MiB', 'GiB'];
  let value = bytes;
  let unit = 0;
  while (Math.abs(value) >= 1024 && unit < units.length - 1) { value /= 1024; unit++; }
  return unit === 0 ? `${Math.round(value)} B` : `${Number(value.toPrecision(3))} ${units[unit]}`;
}

/** "1 wafer", "25 wafers": a count with its noun, plural by adding "s" unless told otherwise. */
export function formatQuantity(count: number, singular: string, plural = `${singular}s`): string {
  return `${formatCount(count)} ${count === 1 ? singular : plural}`;
}
