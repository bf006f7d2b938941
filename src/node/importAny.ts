// Routes a file to its importer by content, not by name: an STDF V4 FAR at byte 0 means STDF,
// text means delimited. Also builds the mapping preview for either kind.

import { statSync } from 'node:fs';
import { basename } from 'node:path';
import { DelimitedReader, previewRecords, type ColumnMapping, type ImportPreview, type LineRecord, type TestPreview } from '../core/import';
import { looksLikeStdf, StdfFrameBuilder, StdfReader } from '../core/stdf';
import type { ImportResult } from '../shared/api';
import type { Db } from './store/database';
import { ImportError, readHead, type ImportOptions } from './importCommon';
import { importDelimitedFile } from './importDelimited';
import { importStdfFile } from './importStdf';
import { fittingMapping } from './importMappings';

export async function importAnyFile(db: Db, path: string, options: ImportOptions = {}): Promise<ImportResult> {
  return looksLikeStdf(readHead(path, 8)) ? importStdfFile(db, path, options) : importDelimitedFile(db, path, options);
}

const PREVIEW_BYTES = 256 * 1024;
const PREVIEW_RECORDS = 200;

function previewStdf(head: Uint8Array, mapping: ColumnMapping | undefined): ImportPreview {
  const reader = new StdfReader();
  const builder = new StdfFrameBuilder('', mapping?.tests ?? []);
  const counts = new Map<number, number>();
  const errors: string[] = [];
  try {
    const records = reader.push(head);
    if (reader.little !== undefined) builder.setByteOrder(reader.little);
    for (const r of records) {
      builder.add(r);
      if (r.typ === 15 && (r.sub === 10 || r.sub === 15) && r.body.byteLength >= 4) {
        const num = r.body.getUint32(0, reader.little);
        counts.set(num, (counts.get(num) ?? 0) + 1);
      }
    }
  } catch (error) {
    errors.push((error as Error).message);
  }
  const tests: TestPreview[] = builder.testList().map((t) => ({ test: t.text || `#${t.number}`, number: t.number, name: t.name, unit: t.unit, scale: t.scale, count: counts.get(t.number) ?? 0 }));
  return {
    format: 'stdf', layout: 'long', columns: [], tests, sampleRows: builder.report.parts,
    mapping: { ...mapping, tests: tests.map((t) => ({ test: t.number !== undefined ? `#${t.number}` : t.test, name: t.name })) },
    errors, warnings: builder.report.warnings.slice(0, 10),
  };
}

/** The preview of a file's opening bytes (the whole file is not needed). */
/** partial: the bytes are only the start of the file, so a last line without a line break is cut off. */
export function previewHead(db: Db | undefined, head: Uint8Array, mapping: ColumnMapping | undefined, mappingName?: string, partial = true): ImportPreview {
  if (looksLikeStdf(head)) return previewStdf(head, mapping);
  if (head.subarray(0, 4096).includes(0)) throw new ImportError('This looks like a binary file that is not STDF V4; Offstate reads delimited text and STDF V4.');
  let text = new TextDecoder('utf-8').decode(head);
  const lastBreak = text.lastIndexOf('\n');
  if (partial && lastBreak > 0) text = text.slice(0, lastBreak);
  const reader = new DelimitedReader(mapping?.delimiter);
  const records: LineRecord[] = [];
  for (const r of [...reader.push(text), ...reader.end()]) { records.push(r); if (records.length >= PREVIEW_RECORDS) break; }
  let applied = mappingName;
  let effective = mapping;
  if (!effective && db && records.length > 0) {
    const saved = fittingMapping(db, records[0].fields.map((f) => f.trim()));
    if (saved) { effective = saved.mapping; applied = saved.name; }
  }
  const preview = previewRecords(records, reader.delimiter, effective);
  return applied ? { ...preview, appliedMapping: applied } : preview;
}

export function previewFile(db: Db | undefined, path: string, mapping: ColumnMapping | undefined, mappingName?: string): ImportPreview {
  try {
    const head = readHead(path, PREVIEW_BYTES);
    return previewHead(db, head, mapping, mappingName, head.length < statSync(path).size);
  } catch (error) {
    if (error instanceof ImportError) throw new ImportError(`${basename(path)}: ${error.message}`);
    throw error;
  }
}
