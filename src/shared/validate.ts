// Argument checks for every API method, run by each transport before a call reaches the service,
// so a renderer or a local page can only send what the contract allows.

import type { ApiMethod } from './api';

type ArgKind = 'name' | 'path' | 'bytes' | 'id';

const LIMITS: Record<ArgKind, number> = { name: 512, path: 4096, id: 128, bytes: 4 * 1024 ** 3 };

export const API_ARGS: Record<ApiMethod, ArgKind[]> = {
  getInfo: [],
  listLots: [],
  listWafers: ['name'],
  getWafer: ['name', 'name'],
  analyzeLot: ['name'],
  importFile: ['path'],
  importBytes: ['name', 'bytes'],
  exportFlaggedCsv: ['name'],
  cancelJob: ['id'],
};

export class ArgumentError extends Error {
  override name = 'ArgumentError';
}

/** Throws an ArgumentError with a sentence when args do not fit the method. */
export function validateArgs(method: string, args: unknown): asserts args is unknown[] {
  if (!Object.prototype.hasOwnProperty.call(API_ARGS, method)) throw new ArgumentError(`Unknown API method "${method.slice(0, 64)}".`);
  const kinds = API_ARGS[method as ApiMethod];
  if (!Array.isArray(args)) throw new ArgumentError(`${method} expects a list of arguments.`);
  if (args.length !== kinds.length) throw new ArgumentError(`${method} expects ${kinds.length} argument(s), got ${args.length}.`);
  kinds.forEach((kind, i) => {
    const value = args[i];
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
