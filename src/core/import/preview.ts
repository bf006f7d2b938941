// The mapping preview: how the first records of a file are understood (role, parameter name, unit,
// scale and sample values per column), plus the mapping that reproduces it, for the user to correct.

import type { Delimiter, LineRecord } from './delimited';
import { looksLikeHeader, measurementOf, type ColumnPlan, type Layout } from './headers';
import { mappingFits, planWithMapping, type ColumnMapping } from './mapping';

/** A column as planned (role, name, unit, scale), with what it holds. */
export interface ColumnPreview extends ColumnPlan {
  /** The first few values of the column as written. */
  samples: string[];
}

/** A test of a long-layout or STDF file as it will be stored. */
export interface TestPreview {
  /** Test name as written, or "#<number>" for an STDF test without a name. */
  test: string;
  /** STDF test number, when there is one. */
  number?: number;
  name: string;
  unit: string;
  scale: number;
  /** Results seen in the previewed part of the file. */
  count: number;
}

export interface ImportPreview {
  format: 'delimited' | 'stdf';
  layout: Layout;
  delimiter?: Delimiter;
  /** 1-based line of the header (delimited). */
  headerLine?: number;
  columns: ColumnPreview[];
  tests: TestPreview[];
  /** Data records looked at. */
  sampleRows: number;
  /** The mapping to send back (corrected) to importFile or saveMapping. */
  mapping: ColumnMapping;
  /** Name of the saved mapping that was applied because it fits these headers, if any. */
  appliedMapping?: string;
  errors: string[];
  warnings: string[];
}

const SAMPLES = 5;

/** Builds the preview from the first records of a delimited file (header first). */
export function previewRecords(records: LineRecord[], delimiter: Delimiter | undefined, mapping: ColumnMapping | undefined): ImportPreview {
  if (records.length === 0) {
    return { format: 'delimited', layout: 'wide', delimiter, columns: [], tests: [], sampleRows: 0, mapping: mapping ?? {}, errors: ['No header line was found.'], warnings: [] };
  }
  const [header, ...rest] = records;
  const plan = planWithMapping(header.fields, mapping);
  const data = rest.filter((r) => !looksLikeHeader(r.fields, plan));
  const columns: ColumnPreview[] = plan.columns.map((c) => ({
    ...c,
    samples: data.slice(0, SAMPLES).map((r) => (r.fields[c.index] ?? '').trim()),
  }));
  const tests: TestPreview[] = [];
  if (plan.layout === 'long') {
    const testCol = plan.columns.find((c) => c.role === 'test')!.index;
    const unitCol = plan.columns.find((c) => c.role === 'unit')?.index;
    const overrides = new Map((mapping?.tests ?? []).map((t) => [t.test.trim().toLowerCase(), t]));
    const seen = new Map<string, { unit: string; count: number }>();
    for (const r of data) {
      const t = (r.fields[testCol] ?? '').trim();
      if (!t) continue;
      const entry = seen.get(t) ?? { unit: unitCol === undefined ? '' : (r.fields[unitCol] ?? '').trim(), count: 0 };
      entry.count++;
      seen.set(t, entry);
    }
    for (const [test, { unit, count }] of seen) {
      const o = overrides.get(test.toLowerCase());
      if (o && o.name.trim() === '') { tests.push({ test, name: '', unit: '', scale: 1, count }); continue; }
      const m = measurementOf(o?.name || test, o?.unit || (unit === '' ? undefined : unit));
      tests.push({ test, name: m.name, unit: m.unit, scale: m.scale, count });
    }
  }
  const headers = header.fields.map((f) => f.trim());
  const effective: ColumnMapping = {
    ...mapping,
    headers,
    delimiter,
    ...(tests.length > 0 ? { tests: tests.map((t) => {
      const unit = mapping?.tests?.find((o) => o.test.trim().toLowerCase() === t.test.toLowerCase())?.unit;
      return { test: t.test, name: t.name, ...(unit ? { unit } : {}) };
    }) } : {}),
    columns: plan.columns.map((c) => {
      // Keep a unit the user gave (the header alone would not say it); otherwise the header decides.
      const given = mapping?.columns?.find((o) => o.header.trim().toLowerCase() === c.header.toLowerCase())?.unit;
      return { header: c.header, role: c.role, ...(c.role === 'measurement' ? { name: c.name, ...(given ? { unit: given } : {}) } : {}) };
    }),
  };
  const warnings = [...plan.warnings];
  if (mapping?.headers && !mappingFits(mapping, headers)) warnings.push('The mapping was made for a file with other headers; check every column.');
  return { format: 'delimited', layout: plan.layout, delimiter, headerLine: header.line, columns, tests, sampleRows: data.length, mapping: effective, errors: plan.errors, warnings };
}
