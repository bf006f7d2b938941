// Desktop transport: the Electron preload exposes the OffstateApi methods on window.offstate
// (through contextBridge), plus pathForFile to learn where a dropped or chosen file lives.

import type { ImportResult, OffstateApi } from '../../shared/api';

/** What the preload exposes. Keep in step with electron/'s preload. */
export interface DesktopBridge extends OffstateApi {
  /** Path of a File on disk, '' when it has none (e.g. dragged from another app's memory). */
  pathForFile(file: File): string;
}

declare global {
  interface Window { offstate?: DesktopBridge }
}

export function desktopBridge(): DesktopBridge | undefined {
  return typeof window !== 'undefined' ? window.offstate : undefined;
}

/** Imports by path when the file is on disk (the Node side streams it), else by its bytes. */
export async function importWithBridge(bridge: DesktopBridge, file: File): Promise<ImportResult> {
  let path = '';
  try { path = bridge.pathForFile(file); } catch { path = ''; }
  if (path) return bridge.importFile(path);
  return bridge.importBytes(file.name, new Uint8Array(await file.arrayBuffer()));
}
