// Imports one STDF V4 file: streams it from disk (hashing as it reads) through the pure record
// reader, writes each wafer when its WRR arrives inside one open transaction, and commits at the
// end. A truncated or corrupt file raises an ImportError with the byte offset and stores nothing.

import { createReadStream, statSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { basename, extname } from 'node:path';
import { StdfError, StdfFrameBuilder, StdfReader } from '../core/stdf';
import type { ImportResult } from '../shared/api';
import type { Db } from './store/database';
import { CancelledError, CHUNK_BYTES, ImportError, MAX_MESSAGES, throttle, type ImportOptions } from './importCommon';
import { alreadyImported, ImportWriter } from './importStore';

export async function importStdfFile(db: Db, path: string, options: ImportOptions = {}): Promise<ImportResult> {
  const started = performance.now();
  const fileName = options.fileName ?? basename(path);
  const bytesTotal = statSync(path).size;
  const hash = createHash('sha256');
  const reader = new StdfReader();
  const builder = new StdfFrameBuilder(basename(fileName, extname(fileName)), options.mapping?.tests ?? [], options.mapping?.lot);
  const writer = new ImportWriter(db, fileName, bytesTotal);
  const progress = throttle(options);
  let bytesDone = 0;
  const stream = createReadStream(path, { highWaterMark: CHUNK_BYTES });
  const flush = (wafers: ReturnType<StdfFrameBuilder['takeFinished']>) => {
    for (const w of wafers) writer.write({ frame: w.frame, hardBin: w.hardBin, softBin: w.softBin, geometry: builder.geometry });
  };
  try {
    try {
      for await (const chunk of stream as AsyncIterable<Buffer>) {
        if (options.signal?.aborted) throw new CancelledError();
        hash.update(chunk);
        bytesDone += chunk.byteLength;
        if (!writer.conflict) {
          const records = reader.push(new Uint8Array(chunk.buffer, chunk.byteOffset, chunk.byteLength));
          if (reader.little !== undefined) builder.setByteOrder(reader.little);
          for (const record of records) builder.add(record);
          flush(builder.takeFinished());
        }
        progress({ bytesDone, bytesTotal, rows: builder.report.parts });
      }
      if (!writer.conflict) {
        reader.end();
        flush(builder.finish());
      }
    } catch (error) {
      if (error instanceof StdfError) throw new ImportError(`${fileName}: ${error.message} Nothing was stored.`);
      throw error;
    }
    const digest = hash.digest('hex');
    const again = alreadyImported(db, digest, fileName, started);
    if (again) { writer.abort(); return again; }
    const r = builder.report;
    if (r.diesStored === 0 && !writer.conflict) throw new ImportError(`${fileName}: no die could be stored (${r.parts} PRR record(s) read, ${r.partsRejected} rejected).`);
    const unusable = Object.entries(r.unusableBy).map(([k, n]) => `${n} ${k}`).join(', ');
    const messages = [
      `STDF V4, ${reader.little ? 'little' : 'big'}-endian (FAR CPU_TYPE ${reader.cpuType}); ${r.records} records, ${r.parts} parts${builder.sites.length ? `, sites ${builder.sites.join(', ')} (SDR)` : ''}.`,
      ...(builder.mir?.testTemp?.trim() ? [`Test temperature (MIR TST_TEMP): ${builder.mir.testTemp.trim()}.`] : []),
      ...(r.retests > 0 ? [`${r.retests} retested die(s) superseded the earlier result at the same X/Y.`] : []),
      ...(r.repeatsReplaced > 0 ? [`${r.repeatsReplaced} die(s) appeared twice on a wafer without the retest flag; the later one was kept.`] : []),
      ...(r.unusableResults > 0 ? [`${r.unusableResults} result(s) left out because their flags mark them unusable (${unusable}).`] : []),
      ...(r.skippedRecords > 0 ? [`${r.skippedRecords} record(s) of types Offstate does not use were skipped.`] : []),
      ...writer.mergedWithOtherFiles,
      ...r.warnings.slice(0, MAX_MESSAGES),
    ];
    if (options.signal?.aborted) throw new CancelledError();
    const result: ImportResult = {
      status: 'imported',
      file: fileName,
      hash: digest,
      lots: writer.lotNames,
      wafers: writer.waferCount,
      rows: r.diesStored,
      rejected: r.partsRejected,
      messages,
      seconds: (performance.now() - started) / 1000,
      format: 'stdf',
      rowsRead: r.parts,
      rejectedBy: r.rejectedBy,
      duplicatesReplaced: r.repeatsReplaced,
      retests: r.retests,
      unusableResults: r.unusableResults,
      unusableBy: r.unusableBy,
      ...(builder.geometry ? { geometry: builder.geometry } : {}),
      ...(options.mappingName ? { mapping: options.mappingName } : {}),
    };
    writer.finish(digest, result);
    options.onProgress?.({ bytesDone: bytesTotal, bytesTotal, rows: r.parts });
    return result;
  } catch (error) {
    writer.abort();
    throw error;
  } finally {
    stream.destroy();
  }
}
