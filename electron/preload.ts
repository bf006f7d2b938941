// The sandboxed preload: exposes exactly the API contract (one function per method) and
// pathForFile for dropped files; never the raw ipcRenderer.

import { contextBridge, ipcRenderer, webUtils } from 'electron';
import { API_METHODS, type OffstateApi, type ProgressEvent } from '../src/shared/api';

const CHANNEL_PREFIX = 'offstate:';

const api: Record<string, unknown> = {};
for (const method of API_METHODS) {
  api[method] = (...args: unknown[]) => ipcRenderer.invoke(CHANNEL_PREFIX + method, ...args);
}
api.onProgress = (listener: (event: ProgressEvent) => void) => {
  const wrapped = (_event: unknown, progress: ProgressEvent) => listener(progress);
  ipcRenderer.on(CHANNEL_PREFIX + 'progress', wrapped);
  return () => { ipcRenderer.removeListener(CHANNEL_PREFIX + 'progress', wrapped); };
};
api.pathForFile = (file: File) => webUtils.getPathForFile(file);

contextBridge.exposeInMainWorld('offstate', api as unknown as OffstateApi & { pathForFile(file: File): string });
