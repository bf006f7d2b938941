// Reads and writes lots and wafers. A wafer's die data is kept as columnar blobs (one per
// coordinate and per parameter): the access pattern is always a whole wafer or a whole lot.

import type { ParamInfo, WaferFrame } from '../../core/frame';
import type { ImportResult, LotSummary } from '../../shared/api';
import type { Db } from './database';
import { blobOf, float64Of, int32Of } from './blobs';




/** Orders wafer names the way people read them: "2" before "10", "W02" before "W10". */
export function naturalCompare(a: string, b: string): number {
  return a.localeCompare(b, 'en', { numeric: true, sensitivity: 'base' });
}

export interface ImportRecord {
  id: number;
  fileName: string;
  hash: string;
  importedAt: string;
  report: ImportResult;
}

export function findImportByHash(db: Db, hash: string): ImportRecord | undefined {
  const row = db.prepare('SELECT id, file_name, content_hash, imported_at, report FROM imports WHERE content_hash = ?').get(hash) as
    | { id: number; file_name: string; content_hash: string; imported_at: string; report: string }
    | undefined;
  if (!row) return undefined;
  return { id: row.id, fileName: row.file_name, hash: row.content_hash, importedAt: row.imported_at, report: JSON.parse(row.report) };
}

export class DuplicateWaferError extends Error {
  override name = 'DuplicateWaferError';
}

/**
 * Stores the frames of one file and its journal row in one transaction: either all of it lands or
 * none of it. A wafer already in the store from another file is an error (nothing is stored).
 */
export function storeImport(db: Db, frames: WaferFrame[], journal: { fileName: string; hash: string; bytes: number; report: ImportResult }): number {
  const now = new Date().toISOString();
  const insertImport = db.prepare(
    'INSERT INTO imports (file_name, content_hash, bytes, rows_stored, rows_rejected, imported_at, report) VALUES (@fileName, @hash, @bytes, @rows, @rejected, @now, @report)',
  );
  const findLot = db.prepare('SELECT id FROM lots WHERE name = ?');
  const insertLot = db.prepare('INSERT INTO lots (name, created_at) VALUES (?, ?)');
  const findWafer = db.prepare('SELECT w.id, i.file_name FROM wafers w JOIN imports i ON i.id = w.import_id WHERE w.lot_id = ? AND w.name = ?');
  const insertWafer = db.prepare(
    'INSERT INTO wafers (lot_id, name, import_id, die_count, x, y, site) VALUES (@lotId, @name, @importId, @dies, @x, @y, @site)',
  );
  const insertValues = db.prepare(
    'INSERT INTO wafer_values (wafer_id, param, unit, position, data) VALUES (@waferId, @param, @unit, @position, @data)',
  );
  const run = db.transaction(() => {
    const importId = Number(insertImport.run({
      fileName: journal.fileName, hash: journal.hash, bytes: journal.bytes, rows: journal.report.rows,
      rejected: journal.report.rejected, now, report: JSON.stringify(journal.report),
    }).lastInsertRowid);
    for (const frame of frames) {
      let lot = findLot.get(frame.lot) as { id: number } | undefined;
      if (!lot) lot = { id: Number(insertLot.run(frame.lot, now).lastInsertRowid) };
      const existing = findWafer.get(lot.id, frame.wafer) as { id: number; file_name: string } | undefined;
      if (existing) {
        throw new DuplicateWaferError(`Wafer ${frame.wafer} of lot ${frame.lot} is already stored (from ${existing.file_name}); nothing from this file was stored.`);
      }
      const waferId = Number(insertWafer.run({
        lotId: lot.id, name: frame.wafer, importId, dies: frame.x.length,
        x: blobOf(frame.x), y: blobOf(frame.y), site: blobOf(frame.site),
      }).lastInsertRowid);
      frame.params.forEach((param, position) => {
        insertValues.run({ waferId, param: param.name, unit: param.unit, position, data: blobOf(frame.values[param.name]) });
      });
    }
    return importId;
  });
  return run();
}

export function listLots(db: Db): LotSummary[] {
  const rows = db.prepare(`
    SELECT l.id, l.name, l.created_at, count(w.id) AS wafers, coalesce(sum(w.die_count), 0) AS dies
    FROM lots l LEFT JOIN wafers w ON w.lot_id = l.id GROUP BY l.id ORDER BY l.created_at, l.name`).all() as
    { id: number; name: string; created_at: string; wafers: number; dies: number }[];
  const paramsOf = db.prepare(`
    SELECT v.param, v.unit, min(v.position) AS position FROM wafer_values v JOIN wafers w ON w.id = v.wafer_id
    WHERE w.lot_id = ? GROUP BY v.param, v.unit ORDER BY position, v.param`);
  return rows.map((r) => ({
    lot: r.name,
    wafers: r.wafers,
    dies: r.dies,
    importedAt: r.created_at,
    params: (paramsOf.all(r.id) as { param: string; unit: string }[]).map((p) => ({ name: p.param, unit: p.unit })),
  }));
}

export function listWaferNames(db: Db, lot: string): string[] {
  const rows = db.prepare('SELECT w.name FROM wafers w JOIN lots l ON l.id = w.lot_id WHERE l.name = ?').all(lot) as { name: string }[];
  return rows.map((r) => r.name).sort(naturalCompare);
}

export class NotFoundError extends Error {
  override name = 'NotFoundError';
}

/** `shared`: columns in SharedArrayBuffers, for handing to worker threads without a copy. */
export function loadWafer(db: Db, lot: string, wafer: string, options: { shared?: boolean } = {}): WaferFrame {
  const shared = options.shared === true;
  const row = db.prepare('SELECT w.id, w.x, w.y, w.site FROM wafers w JOIN lots l ON l.id = w.lot_id WHERE l.name = ? AND w.name = ?').get(lot, wafer) as
    | { id: number; x: Buffer; y: Buffer; site: Buffer }
    | undefined;
  if (!row) throw new NotFoundError(`No wafer ${wafer} in lot ${lot}.`);
  const valueRows = db.prepare('SELECT param, unit, data FROM wafer_values WHERE wafer_id = ? ORDER BY position').all(row.id) as
    { param: string; unit: string; data: Buffer }[];
  const params: ParamInfo[] = valueRows.map((v) => ({ name: v.param, unit: v.unit }));
  const values: Record<string, Float64Array> = {};
  for (const v of valueRows) values[v.param] = float64Of(v.data, shared);
  return { lot, wafer, x: int32Of(row.x, shared), y: int32Of(row.y, shared), site: int32Of(row.site, shared), params, values };
}

export function loadLot(db: Db, lot: string, options: { shared?: boolean } = {}): WaferFrame[] {
  const names = listWaferNames(db, lot);
  if (names.length === 0) throw new NotFoundError(`No lot ${lot} in this database.`);
  return names.map((name) => loadWafer(db, lot, name, options));
}

export function getSetting(db: Db, key: string): string | undefined {
  const row = db.prepare('SELECT value FROM settings WHERE key = ?').get(key) as { value: string } | undefined;
  return row?.value;
}

export function setSetting(db: Db, key: string, value: string): void {
  db.prepare('INSERT INTO settings (key, value) VALUES (?, ?) ON CONFLICT(key) DO UPDATE SET value = excluded.value').run(key, value);
}
