// Saved column mappings: kept by name in the settings table as JSON, found again by name (CLI
// --mapping NAME, API) or by headers (a saved mapping made for the same header line is applied).

import { readFileSync } from 'node:fs';
import { mappingFits, mappingProblems, type ColumnMapping } from '../core/import';
import type { SavedMapping } from '../shared/api';
import type { Db } from './store/database';
import { getSetting, setSetting } from './store/repository';
import { ImportError } from './importCommon';

const PREFIX = 'import.mapping.';

export function saveMapping(db: Db, name: string, mapping: ColumnMapping): void {
  const problems = mappingProblems(mapping);
  if (problems.length > 0) throw new ImportError(`The mapping "${name}" cannot be saved: ${problems.join(' ')}`);
  if (name.trim() === '') throw new ImportError('A mapping needs a name.');
  setSetting(db, PREFIX + name.trim(), JSON.stringify(mapping));
}

export function listMappings(db: Db): SavedMapping[] {
  const rows = db.prepare('SELECT key, value FROM settings WHERE key LIKE ? ORDER BY key').all(`${PREFIX}%`) as { key: string; value: string }[];
  return rows.map((r) => ({ name: r.key.slice(PREFIX.length), mapping: JSON.parse(r.value) as ColumnMapping }));
}

export function getMapping(db: Db, name: string): ColumnMapping {
  const text = getSetting(db, PREFIX + name.trim());
  if (text === undefined) {
    const known = listMappings(db).map((m) => m.name);
    throw new ImportError(`No saved mapping named "${name}"${known.length ? ` (saved: ${known.join(', ')})` : ''}.`);
  }
  return JSON.parse(text) as ColumnMapping;
}

/** The first saved mapping made for exactly these headers. */
export function fittingMapping(db: Db, headers: string[]): SavedMapping | undefined {
  return listMappings(db).find((m) => mappingFits(m.mapping, headers));
}

/** A mapping given as a name, a path to a .json file, or plain data. */
export function resolveMapping(db: Db, given: ColumnMapping | string | undefined): { mapping?: ColumnMapping; name?: string } {
  if (given === undefined) return {};
  if (typeof given !== 'string') {
    const problems = mappingProblems(given);
    if (problems.length > 0) throw new ImportError(`The mapping is not valid: ${problems.join(' ')}`);
    return { mapping: given };
  }
  if (/\.json$/i.test(given)) {
    let parsed: unknown;
    try { parsed = JSON.parse(readFileSync(given, 'utf8')); } catch (error) { throw new ImportError(`Cannot read the mapping file ${given}: ${(error as Error).message}`); }
    const problems = mappingProblems(parsed);
    if (problems.length > 0) throw new ImportError(`${given} is not a valid mapping: ${problems.join(' ')}`);
    return { mapping: parsed as ColumnMapping, name: given };
  }
  return { mapping: getMapping(db, given), name: given };
}
