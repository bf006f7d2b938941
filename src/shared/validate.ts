// Argument checks for every API method, run by each transport before a call reaches the service,
// so a renderer or a local page can only send what the contract allows.

import type { ApiMethod } from './api';
import { mappingProblems } from '../core/import/mapping';

type ArgKind = 'name' | 'path' | 'bytes' | 'id' | 'base64' | 'mapping' | 'mapping?' | 'importOptions?' | 'plain';

const LIMITS: Record<ArgKind, number> = { name: 512, path: 4096, id: 128, bytes: 4 * 1024 ** 3, base64: 1024 * 1024, mapping: 256 * 1024, 'mapping?': 256 * 1024, 'importOptions?': 256 * 1024, plain: 1024 * 1024 };

function checkMapping(method: string, i: number, value: unknown): void {
  if (typeof value === 'string') {
    if (value.length === 0 || value.length > LIMITS.name || value.includes('\u0000')) throw new ArgumentError(`${method} argument ${i + 1} must be a mapping name of 1 to ${LIMITS.name} characters.`);
    return;
  }
  let size = 0;
  try { size = JSON.stringify(value)?.length ?? 0; } catch { throw new ArgumentError(`${method} argument ${i + 1} must be plain data.`); }
  if (size > LIMITS.mapping) throw new ArgumentError(`${method} argument ${i + 1} is larger than ${LIMITS.mapping} characters.`);
  const problems = mappingProblems(value);
  if (problems.length > 0) throw new ArgumentError(`${method} argument ${i + 1} is not a valid mapping: ${problems.slice(0, 3).join(' ')}`);
}

/** Settings objects and FA edit lists: plain JSON data (object or array) of bounded size. */
function checkPlain(method: string, i: number, value: unknown): void {
  if (value === null || typeof value !== 'object') throw new ArgumentError(`${method} argument ${i + 1} must be an object or a list.`);
  let size = 0;
  try { size = JSON.stringify(value)?.length ?? 0; } catch { throw new ArgumentError(`${method} argument ${i + 1} must be plain data.`); }
  if (size > LIMITS.plain) throw new ArgumentError(`${method} argument ${i + 1} is larger than ${LIMITS.plain} characters.`);
}

export const API_ARGS: Record<ApiMethod, ArgKind[]> = {
  getInfo: [],
  listLots: [],
  listWafers: ['name'],
  getWafer: ['name', 'name'],
  analyzeLot: ['name'],
  importFile: ['path', 'importOptions?'],
  importBytes: ['name', 'bytes'],
  exportFlaggedCsv: ['name'],
  cancelJob: ['id'],
  previewImport: ['path', 'mapping?'],
  previewBytes: ['name', 'base64', 'mapping?'],
  listMappings: [],
  saveMapping: ['name', 'mapping'],
  getLotColumn: ['name', 'name'],
  getSettings: [],
  saveSettings: ['plain'],
  getFaEdits: ['name'],
  saveFaEdits: ['name', 'plain'],
  listDatabases: [],
  openDatabase: ['path'],
};

export class ArgumentError extends Error {
  override name = 'ArgumentError';
}

/** Throws an ArgumentError with a sentence when args do not fit the method. */
export function validateArgs(method: string, args: unknown): asserts args is unknown[] {
  if (!Object.prototype.hasOwnProperty.call(API_ARGS, method)) throw new ArgumentError(`Unknown API method "${method.slice(0, 64)}".`);
  const kinds = API_ARGS[method as ApiMethod];
  if (!Array.isArray(args)) throw new ArgumentError(`${method} expects a list of arguments.`);
  const required = kinds.filter((k) => !k.endsWith('?')).length;
  if (args.length < required || args.length > kinds.length) {
    throw new ArgumentError(`${method} expects ${required === kinds.length ? kinds.length : `${required} to ${kinds.length}`} argument(s), got ${args.length}.`);
  }
  kinds.forEach((kind, i) => {
    const value = args[i];
    if (kind.endsWith('?') && (i >= args.length || value === undefined || value === null)) return;
    if (kind === 'importOptions?') {
      if (typeof value !== 'object' || Array.isArray(value)) throw new ArgumentError(`${method} argument ${i + 1} must be an options object.`);
      const extra = Object.keys(value as object).filter((k) => k !== 'mapping');
      if (extra.length > 0) throw new ArgumentError(`${method} argument ${i + 1} has unknown option "${extra[0].slice(0, 40)}".`);
      const mapping = (value as { mapping?: unknown }).mapping;
      if (mapping !== undefined) checkMapping(method, i, mapping);
      return;
    }
    if (kind === 'mapping' || kind === 'mapping?') { checkMapping(method, i, value); return; }
    if (kind === 'plain') { checkPlain(method, i, value); return; }
    if (kind === 'base64' && (typeof value !== 'string' || !/^[A-Za-z0-9+/]*={0,2}$/.test(value))) throw new ArgumentError(`${method} argument ${i + 1} must be base64 text.`);
    if (kind === 'bytes') {
      if (!(value instanceof Uint8Array)) throw new ArgumentError(`${method} argument ${i + 1} must be bytes.`);
      if (value.byteLength > LIMITS.bytes) throw new ArgumentError(`${method} argument ${i + 1} is larger than ${LIMITS.bytes} bytes.`);
      return;
    }
    if (typeof value !== 'string') throw new ArgumentError(`${method} argument ${i + 1} must be text.`);
    if (value.length === 0 || value.length > LIMITS[kind]) throw new ArgumentError(`${method} argument ${i + 1} must be 1 to ${LIMITS[kind]} characters long.`);
    if (value.includes('\u0000')) throw new ArgumentError(`${method} argument ${i + 1} contains a NUL character.`);
  });
}
