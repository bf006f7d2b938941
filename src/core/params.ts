// Parameter names and units: turns header text such as "Ioff_n [pA]" into a canonical name and a
// scale to SI base units, the contract every importer and every analysis relies on.

export const CANONICAL_PARAMS = [
  'Ioff_n', 'Ion_n', 'Ioff_p', 'Ion_p',
  'Vtlin_n', 'Vtsat_n', 'Vtlin_p', 'Vtsat_p',
  'Ig_n', 'Ig_p', 'Isb',
] as const;
export type CanonicalParam = (typeof CANONICAL_PARAMS)[number];

const CANONICAL_BY_KEY = new Map<string, CanonicalParam>(
  CANONICAL_PARAMS.map((name) => [name.toLowerCase(), name]),
);

/** Unit prefixes the importers accept, with their factor to the base unit. */
const PREFIX: Record<string, number> = {
  '': 1, k: 1e3, m: 1e-3, u: 1e-6, 'µ': 1e-6, 'μ': 1e-6, n: 1e-9, p: 1e-12, f: 1e-15, a: 1e-18,
};

export interface ParsedUnit {
  /** Base unit: "A" or "V". */
  base: 'A' | 'V';
  /** Multiply a value in the written unit by this to get base units. */
  scale: number;
}

/** Parses a unit word such as "pA", "uA", "mV", "A", "amps", "volts". Returns undefined if unknown. */
export function parseUnit(text: string): ParsedUnit | undefined {
  const t = text.trim();
  if (t === '') return undefined;
  const lower = t.toLowerCase();
  if (lower === 'amps' || lower === 'amp' || lower === 'ampere' || lower === 'amperes') return { base: 'A', scale: 1 };
  if (lower === 'volts' || lower === 'volt') return { base: 'V', scale: 1 };
  const match = /^([kmunpfaµμ]?)([av])$/i.exec(t);
  if (!match) return undefined;
  // Testers write units in either case ("PA", "uA"); mega-amps and mega-volts never occur here,
  // so an upper-case M is read as milli.
  const factor = PREFIX[match[1].toLowerCase()];
  if (factor === undefined) return undefined;
  return { base: match[2].toUpperCase() as 'A' | 'V', scale: factor };
}

export interface ParsedHeader {
  /** Canonical name when the word matches one, otherwise the header's own name part. */
  name: string;
  /** True when the name is one of CANONICAL_PARAMS. */
  canonical: boolean;
  /** Unit as written, or undefined when the header carries none. */
  unit?: ParsedUnit;
  /** The unit text as written, for messages. */
  unitText?: string;
}

/**
 * Splits a measurement header into name and unit. Accepted forms: "Ioff_n [A]", "Ion_n (uA)",
 * "IOFF_P (pA)", "Ioff_n_pA", "Ioff_n.nA", "Ioff_n" (no unit). Names match case-insensitively.
 */
export function parseMeasurementHeader(header: string): ParsedHeader {
  const text = header.trim();
  let namePart = text;
  let unitText: string | undefined;
  const bracket = /^(.*?)\s*[[(]\s*([^\])]*)\s*[\])]\s*$/.exec(text);
  if (bracket) {
    namePart = bracket[1].trim();
    unitText = bracket[2].trim();
  } else {
    const suffix = /^(.*?)[_.\s-]([kmunpfaµμ]?[AaVv])$/.exec(text);
    if (suffix && CANONICAL_BY_KEY.has(suffix[1].toLowerCase()) && parseUnit(suffix[2])) {
      namePart = suffix[1];
      unitText = suffix[2];
    }
  }
  const canonicalName = CANONICAL_BY_KEY.get(namePart.toLowerCase());
  const unit = unitText !== undefined ? parseUnit(unitText) : undefined;
  return {
    name: canonicalName ?? namePart,
    canonical: canonicalName !== undefined,
    unit,
    unitText,
  };
}

/** The base unit a canonical parameter is measured in. */
export function canonicalBaseUnit(name: string): 'A' | 'V' | undefined {
  const canonical = CANONICAL_BY_KEY.get(name.toLowerCase());
  if (!canonical) return undefined;
  return canonical.startsWith('Vt') ? 'V' : 'A';
}

/** Currents are analysed as log10 of their magnitude; everything else on the value itself. */
export function isCurrentUnit(unit: string): boolean {
  return unit === 'A';
}

/** Device type of a canonical parameter: "n", "p" or undefined (Isb, custom columns). */
export function deviceOf(name: string): 'n' | 'p' | undefined {
  const m = /_(n|p)$/.exec(name);
  return m ? (m[1] as 'n' | 'p') : undefined;
}

/** Pairs of (Ion, Ioff) parameter names present in a parameter list, one per device type. */
export function tradeoffPairs(names: readonly string[]): { device: 'n' | 'p'; ion: string; ioff: string }[] {
  const pairs: { device: 'n' | 'p'; ion: string; ioff: string }[] = [];
  for (const device of ['n', 'p'] as const) {
    if (names.includes(`Ion_${device}`) && names.includes(`Ioff_${device}`)) {
      pairs.push({ device, ion: `Ion_${device}`, ioff: `Ioff_${device}` });
    }
  }
  return pairs;
}
