// Picks the transport: the desktop bridge when the Electron preload is present, otherwise the
// local browser-mode server. Nothing else in the renderer knows which one is in use.

import type { ImportResult, OffstateApi } from '../../shared/api';
import { desktopBridge, importWithBridge } from './desktop';
import { createHttpApi, takeToken } from './http';

export interface Transport {
  mode: 'desktop' | 'browser';
  api: OffstateApi;
  /** Imports a file the user chose or dropped, the best way this transport allows. */
  importUserFile(file: File): Promise<ImportResult>;
}

export function connect(): Transport {
  const bridge = desktopBridge();
  if (bridge) {
    return { mode: 'desktop', api: bridge, importUserFile: (file) => importWithBridge(bridge, file) };
  }
  const token = takeToken();
  if (!token) {
    throw new Error('This page needs the address Offstate printed when it started (it carries a ?token=...). Open that address again.');
  }
  const api = createHttpApi(token);
  return {
    mode: 'browser',
    api,
    importUserFile: async (file) => api.importBytes(file.name, new Uint8Array(await file.arrayBuffer())),
  };
}
