// Reads numbers typed with an SI prefix and an optional unit: "2 nA", "450m", "0.8 V", "1e-9",
// "25 uA" (SI Brochure, 9th ed., table 7; ASCII "u" and "µ" both stand for micro). Pure.

const PREFIX: Record<string, number> = { a: 1e-18, f: 1e-15, p: 1e-12, n: 1e-9, u: 1e-6, 'µ': 1e-6, 'μ': 1e-6, m: 1e-3, '': 1, k: 1e3, M: 1e6, G: 1e9 };

/** The value in base units, or null when the text is not a number (in that unit). */
export function parseEngineering(text: string, unit = ''): number | null {
  const trimmed = text.trim();
  if (!trimmed) return null;
  const match = /^([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*([afpnuµμmkMG]?)\s*([A-Za-z°]*)$/.exec(trimmed);
  if (!match) return null;
  const [, number, prefix, rest] = match;
  // "m" alone with unit "" would be ambiguous only for metres; a trailing unit must match ours.
  if (rest && rest !== unit) {
    // "mA" read with unit "A": the prefix regex already took "m"; anything else is a wrong unit.
    return null;
  }
  const value = Number(number) * (PREFIX[prefix] ?? NaN);
  return Number.isFinite(value) ? value : null;
}
