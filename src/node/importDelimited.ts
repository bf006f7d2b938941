// Imports one delimited per-die file into the store: streams it from disk (hashing as it reads),
// plans the header (with a mapping if given or saved for these headers), validates rows, and
// writes wafers inside one open transaction as they are finished, so memory stays bounded and a
// failure, a cancel or a killed process leaves the database exactly as it was.
// An STDF file handed here (by content, whatever its name) goes to the STDF importer.

import { createReadStream, statSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { basename, extname } from 'node:path';
import { DelimitedReader, FrameBuilder, looksLikeHeader, planWithMapping, type HeaderPlan, type LineRecord } from '../core/import';
import { looksLikeStdf } from '../core/stdf';
import type { ImportResult } from '../shared/api';
import type { Db } from './store/database';
import { CancelledError, CHUNK_BYTES, ImportError, MAX_COLUMNS, MAX_LINE_BYTES, MAX_MESSAGES, readHead, throttle, type ImportOptions } from './importCommon';
import { alreadyImported, ImportWriter } from './importStore';
import { fittingMapping } from './importMappings';
import { importStdfFile } from './importStdf';

export { ImportError, CancelledError, type ImportOptions, type ImportProgress } from './importCommon';

export async function importDelimitedFile(db: Db, path: string, options: ImportOptions = {}): Promise<ImportResult> {
  const fileName = options.fileName ?? basename(path);
  const bytesTotal = statSync(path).size;
  const head = readHead(path);
  if (looksLikeStdf(head)) return importStdfFile(db, path, options);
  if (head.includes(0)) {
    throw new ImportError(`${fileName} looks like a binary file, not delimited text; Offstate reads CSV, TSV and semicolon-separated files and STDF V4.`);
  }
  const started = performance.now();
  const hash = createHash('sha256');
  const decoder = new TextDecoder('utf-8');
  const reader = new DelimitedReader(options.mapping?.delimiter);
  const defaultLot = options.mapping?.lot ?? basename(fileName, extname(fileName));
  let plan: HeaderPlan | undefined;
  let builder: FrameBuilder | undefined;
  let writer: ImportWriter | undefined;
  let mappingName = options.mappingName;
  let repeatedHeaders = 0;
  let firstHeader = '';
  let bytesDone = 0;
  const progress = throttle(options);

  const take = (records: LineRecord[]) => {
    for (let i = 0; i < records.length; i++) {
      const record = records[i];
      if (!plan) {
        if (record.fields.length > MAX_COLUMNS) {
          throw new ImportError(`${fileName}: the header on line ${record.line} has ${record.fields.length.toLocaleString('en')} columns; Offstate reads at most ${MAX_COLUMNS.toLocaleString('en')}. Nothing was stored.`);
        }
        let mapping = options.mapping;
        if (!mapping) {
          const saved = fittingMapping(db, record.fields.map((f) => f.trim()));
          if (saved) { mapping = saved.mapping; mappingName = saved.name; }
        }
        plan = planWithMapping(record.fields, mapping);
        if (plan.errors.length > 0) {
          throw new ImportError(`${fileName}: the header on line ${record.line} cannot be read: ${plan.errors.join(' ')}`);
        }
        firstHeader = plan.columns[0].header;
        builder = new FrameBuilder(plan, mapping?.lot ?? defaultLot, { grid: mapping?.grid, tests: mapping?.tests, maxHeldCells: options.maxHeldCells });
        writer = new ImportWriter(db, fileName, bytesTotal);
        continue;
      }
      const fields = record.fields;
      if (fields.length === plan.columns.length && fields[0].trim() === firstHeader && looksLikeHeader(fields, plan)) { repeatedHeaders++; continue; }
      if (record.unterminated) { builder!.rejectUnreadable(record.line, 'the file ends inside a quoted field that starts here (the file may be cut short)'); continue; }
      builder!.add(record.line, fields);
    }
    if (builder && writer) for (const frame of builder.takeEvicted()) writer.write({ frame });
  };

  // Input is cut at line breaks here. Lines of a wide file go through the byte fast path
  // (FrameBuilder.addLineBytes); every line it declines goes, in order, through the string
  // reader, which keeps line numbers in step and handles quoted fields spanning lines.
  let leftover: Uint8Array | undefined;
  let lineNo = 0;
  let first = true;
  const slowText = (bytes: Uint8Array, firstLine: number) => {
    // A block cut after its last line break holds no line after that break.
    const whole = bytes.length > 0 && bytes[bytes.length - 1] === 10 ? bytes.subarray(0, bytes.length - 1) : bytes;
    const text = decoder.decode(whole);
    take(reader.pushLines(text, firstLine));
  };
  const feed = (bytes: Uint8Array) => {
    if (bytes.length === 0) return;
    const delimiter = reader.delimiter?.charCodeAt(0) ?? 44;
    if (!plan || !builder || plan.layout !== 'wide' || options.fastPath === false) {
      slowText(bytes, lineNo + 1);
      lineNo = reader.currentLine;
      return;
    }
    let start = 0;
    const n = bytes.length;
    while (start < n) {
      lineNo++;
      const c = bytes[start];
      // Inside a quoted field that spans lines the string reader must see every line.
      let end = !reader.inQuotedField && c !== 35 && c !== 47 && c !== 32 && c !== 9 && c !== 10 && c !== 13 ? builder.addLineBytes(bytes, start, n, delimiter) : -1;
      if (end < 0) {
        end = bytes.indexOf(10, start);
        if (end === -1) end = n;
        let e = end;
        if (e > start && bytes[e - 1] === 13) e--;
        slowText(bytes.subarray(start, e), lineNo); // in order: the later row of a die must win
      }
      start = end + 1;
    }
    lineNo = Math.max(lineNo, reader.currentLine);
  };
  const stream = createReadStream(path, { highWaterMark: CHUNK_BYTES });
  try {
    for await (const buffer of stream as AsyncIterable<Buffer>) {
      if (options.signal?.aborted) throw new CancelledError();
      hash.update(buffer);
      bytesDone += buffer.byteLength;
      // After a conflict nothing will be stored: only the hash is still needed (it may be a re-import).
      if (!writer?.conflict) {
        let chunk: Uint8Array = new Uint8Array(buffer.buffer, buffer.byteOffset, buffer.byteLength);
        if (first) {
          first = false;
          if (chunk[0] === 0xef && chunk[1] === 0xbb && chunk[2] === 0xbf) chunk = chunk.subarray(3);
        }
        if (leftover) {
          const joined = new Uint8Array(leftover.length + chunk.length);
          joined.set(leftover);
          joined.set(chunk, leftover.length);
          chunk = joined;
          leftover = undefined;
        }
        const lastBreak = chunk.lastIndexOf(10);
        if (lastBreak === -1) {
          if (chunk.length > MAX_LINE_BYTES) {
            throw new ImportError(`${fileName}: line ${lineNo + 1} runs on for more than ${MAX_LINE_BYTES >> 20} MiB with no line break, so this is not a per-die table (one die per line). Nothing was stored.`);
          }
          leftover = chunk.slice();
        } else {
          if (lastBreak + 1 < chunk.length) leftover = chunk.slice(lastBreak + 1);
          feed(chunk.subarray(0, lastBreak + 1));
          if (builder && writer) for (const frame of builder.takeEvicted()) writer.write({ frame });
        }
      }
      progress({ bytesDone, bytesTotal, rows: builder?.report.rowsRead ?? 0 });
    }
    if (!writer?.conflict) {
      if (leftover) { slowText(leftover, lineNo + 1); lineNo = reader.currentLine; }
      take(reader.end());
    }
    if (!plan || !builder || !writer) throw new ImportError(`${fileName} is empty: no header line was found.`);
    const digest = hash.digest('hex');
    const again = alreadyImported(db, digest, fileName, started);
    if (again) { writer.abort(); return again; }
    const report = builder.report;
    for (const frame of builder.frames()) writer.write({ frame });
    if (report.rowsStored === 0) {
      const first = report.rejected.slice(0, 5).map((r) => `line ${r.line}: ${r.reason}`).join('; ');
      throw new ImportError(`${fileName}: no row could be stored (${report.rejectedCount} rejected${first ? `; ${first}` : ''}).`);
    }
    const kinds = Object.entries(report.rejectedBy).map(([k, n]) => `${n} ${k}`).join(', ');
    const messages = [
      ...(mappingName ? [`Read with the mapping "${mappingName}".`] : []),
      ...plan.warnings,
      ...(repeatedHeaders > 0 ? [`${repeatedHeaders} repeated header line(s) skipped.`] : []),
      ...(report.duplicatesReplaced > 0 ? [`${report.duplicatesReplaced} ${plan.layout === 'long' ? 'die and test pair(s)' : 'die(s)'} appeared twice on a wafer; the later row was kept.`] : []),
      ...(report.rowsLeftOut > 0 ? [`${report.rowsLeftOut} row(s) of tests the mapping leaves out were skipped.`] : []),
      ...writer.mergedWithOtherFiles,
      ...(report.rejectedCount > 0 ? [`${report.rowsRead} rows read, ${report.rowsStored} stored, ${report.rejectedCount} rejected (${kinds}).`] : []),
      ...report.rejected.slice(0, MAX_MESSAGES).map((r) => `Line ${r.line} rejected: ${r.reason}.`),
    ];
    if (report.rejectedCount > MAX_MESSAGES) messages.push(`... and ${report.rejectedCount - MAX_MESSAGES} more rejected rows.`);
    if (options.signal?.aborted) throw new CancelledError();
    const result: ImportResult = {
      status: 'imported',
      file: fileName,
      hash: digest,
      lots: writer.lotNames,
      wafers: writer.waferCount,
      rows: report.rowsStored,
      rejected: report.rejectedCount,
      messages,
      seconds: (performance.now() - started) / 1000,
      format: 'delimited',
      layout: plan.layout,
      rowsRead: report.rowsRead,
      rejectedBy: report.rejectedBy,
      duplicatesReplaced: report.duplicatesReplaced,
      ...(mappingName ? { mapping: mappingName } : {}),
    };
    writer.finish(digest, result);
    options.onProgress?.({ bytesDone: bytesTotal, bytesTotal, rows: report.rowsRead });
    return result;
  } catch (error) {
    writer?.abort();
    throw error;
  } finally {
    stream.destroy();
  }
}
