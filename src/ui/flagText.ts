// Words for flagged dies in the views (ordering and shortening of core's reason sentences) and
// the name of the exported CSV file. Pure functions.

import { reasonText, type Reason } from '../core/analysis';

/** One reason as text, in the words the FA CSV and the report use too. */
export function describeReason(reason: Reason): string {
  return reasonText(reason);
}

/** Reasons strongest first (largest |z|). */
export function strongestFirst(reasons: readonly Reason[]): Reason[] {
  return [...reasons].sort((a, b) => Math.abs(b.score) - Math.abs(a.score));
}

/** All reasons of a die, strongest first, joined with "; ". */
export function describeReasons(reasons: readonly Reason[]): string {
  return strongestFirst(reasons).map(describeReason).join('; ');
}

/** The strongest `shown` reasons, then how many more there are: "...; (+3 more)". */
export function summariseReasons(reasons: readonly Reason[], shown = 2): string {
  const sorted = strongestFirst(reasons);
  const text = sorted.slice(0, shown).map(describeReason).join('; ');
  const rest = sorted.length - shown;
  return rest > 0 ? `${text}; (+${rest} more)` : text;
}

/**
 * A file name that is safe on Windows, macOS and Linux: keeps letters, digits, dot, dash and
 * underscore, turns every other run of characters into one "_", never starts with a dot, and
 * stays short. Falls back to "lot" when nothing usable is left.
 */
export function safeFileStem(text: string, maxLength = 80): string {
  let stem = text.normalize('NFKD').replace(/[^A-Za-z0-9._-]+/g, '_');
  stem = stem.replace(/^[._]+/, '').replace(/[._]+$/, '');
  stem = stem.slice(0, maxLength);
  // Windows reserves these device names whatever the extension.
  if (/^(con|prn|aux|nul|com\d|lpt\d)$/i.test(stem)) stem = `${stem}_`;
  return stem === '' ? 'lot' : stem;
}

/** The download name of a lot's FA list: "<lot>-flagged.csv". */
export function flaggedCsvFileName(lot: string): string {
  return `${safeFileStem(lot)}-flagged.csv`;
}
