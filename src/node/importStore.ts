// Writes one import into the store inside one open transaction, wafer by wafer as the reader
// finishes them, so memory stays bounded however large the file is. Nothing is visible to other
// connections until commit(); abort(), an exception or the process dying leaves the database as it
// was (SQLite rolls back an uncommitted transaction).
//
// Rule for a wafer that is already stored (the same lot and wafer name):
// - from this same file (the reader handed the wafer out early and the file brought it back):
//   merged, a die given again keeps the later values;
// - from another file: merged when none of the new dies is already stored (one wafer tested in
//   parts, e.g. split over several files); if any die overlaps, the whole file is refused and
//   nothing of it is stored, since silently replacing another file's readings would hide a retest
//   the engineer should decide about.

import { randomUUID } from 'node:crypto';
import type { WaferFrame } from '../core/frame';
import { mergeParts, overlappingDies, type WaferPart } from '../core/import';
import type { WaferGeometry } from '../core/stdf';
import type { ImportResult } from '../shared/api';
import type { Db } from './store/database';
import { DuplicateWaferError, findImportByHash, loadWafer, type ImportRecord } from './store/repository';
import { blobOf, int32Of } from './store/blobs';



export interface StoredWafer {
  frame: WaferFrame;
  hardBin?: Int32Array;
  softBin?: Int32Array;
  geometry?: WaferGeometry;
}

export class ImportWriter {
  private importId = 0;
  private open = true;
  /** Set when a wafer overlaps one from another file; the import then stores nothing. */
  conflict: string | undefined;
  readonly mergedWithOtherFiles: string[] = [];
  private readonly written = new Set<string>();
  private readonly diesFromThisFile = new Map<string, number>();
  private readonly lots = new Set<string>();
  private readonly stmt;

  constructor(private readonly db: Db, private readonly fileName: string, private readonly bytes: number) {
    if (db.inTransaction) throw new Error('Another import is still running on this database connection; try again when it has finished.');
    this.stmt = {
      findLot: db.prepare('SELECT id FROM lots WHERE name = ?'),
      insertLot: db.prepare('INSERT INTO lots (name, created_at) VALUES (?, ?)'),
      findWafer: db.prepare('SELECT w.id, w.import_id, i.file_name FROM wafers w JOIN imports i ON i.id = w.import_id WHERE w.lot_id = ? AND w.name = ?'),
      insertWafer: db.prepare('INSERT INTO wafers (lot_id, name, import_id, die_count, x, y, site) VALUES (@lotId, @name, @importId, @dies, @x, @y, @site)'),
      updateWafer: db.prepare('UPDATE wafers SET die_count = @dies, x = @x, y = @y, site = @site WHERE id = @id'),
      deleteValues: db.prepare('DELETE FROM wafer_values WHERE wafer_id = ?'),
      insertValues: db.prepare('INSERT INTO wafer_values (wafer_id, param, unit, position, data) VALUES (@waferId, @param, @unit, @position, @data)'),
      findBins: db.prepare('SELECT hard, soft FROM wafer_bins WHERE wafer_id = ?'),
      putBins: db.prepare('INSERT INTO wafer_bins (wafer_id, hard, soft) VALUES (?, ?, ?) ON CONFLICT(wafer_id) DO UPDATE SET hard = excluded.hard, soft = excluded.soft'),
      putGeometry: db.prepare(`INSERT INTO wafer_geometry (wafer_id, wafer_size, die_height, die_width, units, flat, center_x, center_y, pos_x, pos_y)
        VALUES (@id, @waferSize, @dieHeight, @dieWidth, @units, @flat, @centerX, @centerY, @posX, @posY)
        ON CONFLICT(wafer_id) DO UPDATE SET wafer_size = excluded.wafer_size, die_height = excluded.die_height, die_width = excluded.die_width,
        units = excluded.units, flat = excluded.flat, center_x = excluded.center_x, center_y = excluded.center_y, pos_x = excluded.pos_x, pos_y = excluded.pos_y`),
      putSource: db.prepare('INSERT INTO wafer_sources (wafer_id, import_id, dies) VALUES (?, ?, ?) ON CONFLICT(wafer_id, import_id) DO UPDATE SET dies = excluded.dies'),
    };
  }

  /** The transaction starts at the first write, so a file being parsed holds no lock yet. */
  private begin(): void {
    if (this.importId !== 0) return;
    const db = this.db;
    db.exec('BEGIN IMMEDIATE');
    try {
      this.importId = Number(db.prepare(
        'INSERT INTO imports (file_name, content_hash, bytes, rows_stored, rows_rejected, imported_at, report) VALUES (?, ?, ?, 0, 0, ?, ?)',
      ).run(this.fileName, `pending:${randomUUID()}`, this.bytes, new Date().toISOString(), '{}').lastInsertRowid);
    } catch (error) {
      db.exec('ROLLBACK');
      throw error;
    }
  }

  get lotNames(): string[] { return [...this.lots]; }
  get waferCount(): number { return this.written.size; }

  write(wafer: StoredWafer): void {
    if (!this.open || this.conflict) return;
    this.begin();
    const { frame } = wafer;
    const now = new Date().toISOString();
    let lot = this.stmt.findLot.get(frame.lot) as { id: number } | undefined;
    if (!lot) lot = { id: Number(this.stmt.insertLot.run(frame.lot, now).lastInsertRowid) };
    const existing = this.stmt.findWafer.get(lot.id, frame.wafer) as { id: number; import_id: number; file_name: string } | undefined;
    const key = `${frame.lot}\u0000${frame.wafer}`;
    let part: WaferPart = { frame, extras: wafer.hardBin ? { hardBin: wafer.hardBin, softBin: wafer.softBin ?? new Int32Array(frame.x.length).fill(-1) } : undefined };
    let waferId: number;
    if (!existing) {
      waferId = Number(this.stmt.insertWafer.run({
        lotId: lot.id, name: frame.wafer, importId: this.importId, dies: frame.x.length, x: blobOf(frame.x), y: blobOf(frame.y), site: blobOf(frame.site),
      }).lastInsertRowid);
    } else {
      const stored = loadWafer(this.db, frame.lot, frame.wafer);
      if (!this.written.has(key)) {
        const overlap = overlappingDies(stored, frame);
        if (overlap > 0) {
          this.conflict = `Wafer ${frame.wafer} of lot ${frame.lot} is already stored (from ${existing.file_name}) and ${overlap} of its dies in this file are already there; nothing from this file was stored. Remove the earlier import or the repeated dies first.`;
          return;
        }
        this.mergedWithOtherFiles.push(`Wafer ${frame.wafer} of lot ${frame.lot}: ${frame.x.length} dies added to the ${stored.x.length} already stored from ${existing.file_name} (no die overlaps).`);
      }
      const bins = this.stmt.findBins.get(existing.id) as { hard: Buffer; soft: Buffer } | undefined;
      const base: WaferPart = { frame: stored, extras: bins ? { hardBin: int32Of(bins.hard), softBin: int32Of(bins.soft) } : undefined };
      part = mergeParts(base, part);
      waferId = existing.id;
      const f = part.frame;
      this.stmt.updateWafer.run({ id: waferId, dies: f.x.length, x: blobOf(f.x), y: blobOf(f.y), site: blobOf(f.site) });
      this.stmt.deleteValues.run(waferId);
    }
    const f = part.frame;
    f.params.forEach((param, position) => {
      this.stmt.insertValues.run({ waferId, param: param.name, unit: param.unit, position, data: blobOf(f.values[param.name]) });
    });
    if (part.extras?.hardBin) this.stmt.putBins.run(waferId, blobOf(part.extras.hardBin), blobOf(part.extras.softBin ?? new Int32Array(f.x.length).fill(-1)));
    if (wafer.geometry) {
      const g = wafer.geometry;
      this.stmt.putGeometry.run({
        id: waferId, waferSize: g.waferSize ?? null, dieHeight: g.dieHeight ?? null, dieWidth: g.dieWidth ?? null, units: g.units ?? null,
        flat: g.flat ?? null, centerX: g.centerX ?? null, centerY: g.centerY ?? null, posX: g.posX ?? null, posY: g.posY ?? null,
      });
    }
    this.diesFromThisFile.set(key, (this.diesFromThisFile.get(key) ?? 0) + frame.x.length);
    this.stmt.putSource.run(waferId, this.importId, this.diesFromThisFile.get(key)!);
    this.written.add(key);
    this.lots.add(frame.lot);
  }

  /**
   * Ends the import. Returns the earlier import when these bytes were imported before (nothing is
   * stored); throws DuplicateWaferError on a conflict (nothing is stored); otherwise commits.
   */
  finish(hash: string, report: ImportResult): ImportRecord | undefined {
    if (!this.open) throw new Error('This import was already finished.');
    const earlier = findImportByHash(this.db, hash);
    if (earlier) { this.abort(); return earlier; }
    if (this.conflict) { const message = this.conflict; this.abort(); throw new DuplicateWaferError(message); }
    this.begin();
    this.db.prepare('UPDATE imports SET content_hash = ?, rows_stored = ?, rows_rejected = ?, report = ? WHERE id = ?')
      .run(hash, report.rows, report.rejected, JSON.stringify(report), this.importId);
    this.db.exec('COMMIT');
    this.open = false;
    return undefined;
  }

  /** Rolls everything back; safe to call more than once. */
  abort(): void {
    if (!this.open) return;
    this.open = false;
    if (this.db.inTransaction) this.db.exec('ROLLBACK');
  }
}

/** The wafer geometry stored for a wafer (from an STDF WCR), or undefined. */
export function loadWaferGeometry(db: Db, lot: string, wafer: string): WaferGeometry | undefined {
  const row = db.prepare(`SELECT g.* FROM wafer_geometry g JOIN wafers w ON w.id = g.wafer_id JOIN lots l ON l.id = w.lot_id WHERE l.name = ? AND w.name = ?`).get(lot, wafer) as
    Record<string, number | string | null> | undefined;
  if (!row) return undefined;
  const g: Record<string, unknown> = {};
  const names: Record<string, string> = { wafer_size: 'waferSize', die_height: 'dieHeight', die_width: 'dieWidth', units: 'units', flat: 'flat', center_x: 'centerX', center_y: 'centerY', pos_x: 'posX', pos_y: 'posY' };
  for (const [column, name] of Object.entries(names)) if (row[column] !== null && row[column] !== undefined) g[name] = row[column];
  return g as WaferGeometry;
}

/** Hard and soft bins per die of a stored wafer (STDF PRR), in the wafer's die order, or undefined. */
export function loadWaferBins(db: Db, lot: string, wafer: string): { hardBin: Int32Array; softBin: Int32Array } | undefined {
  const row = db.prepare('SELECT b.hard, b.soft FROM wafer_bins b JOIN wafers w ON w.id = b.wafer_id JOIN lots l ON l.id = w.lot_id WHERE l.name = ? AND w.name = ?').get(lot, wafer) as
    { hard: Buffer; soft: Buffer } | undefined;
  return row ? { hardBin: int32Of(row.hard), softBin: int32Of(row.soft) } : undefined;
}

/** The result for bytes imported before: nothing changes. */
export function alreadyImported(db: Db, digest: string, fileName: string, started: number): ImportResult | undefined {
  const earlier = findImportByHash(db, digest);
  if (!earlier) return undefined;
  return {
    ...earlier.report,
    status: 'already-imported',
    file: fileName,
    messages: [`${fileName} was already imported on ${earlier.importedAt} (as ${earlier.fileName}); nothing changed.`],
    seconds: (performance.now() - started) / 1000,
  };
}

