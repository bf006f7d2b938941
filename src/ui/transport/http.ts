// Browser-mode transport: the OffstateApi over the local HTTP server on 127.0.0.1. The page is
// opened with ?token=...; the token is kept in sessionStorage and taken out of the address bar
// so it does not end up in bookmarks or screenshots. Every answer is a codec payload holding
// { ok: true, result } or { ok: false, error: { message } }.

import type { ImportResult, OffstateApi, ProgressEvent } from '../../shared/api';
import { decodePayload } from '../../shared/codec';

const TOKEN_STORAGE_KEY = 'offstate.token';
const TOKEN_HEADER = 'X-Offstate-Token';

type Envelope<T> = { ok: true; result: T } | { ok: false; error: { message: string } };

function readStoredToken(): string | undefined {
  try { return sessionStorage.getItem(TOKEN_STORAGE_KEY) ?? undefined; } catch { return undefined; }
}

function storeToken(token: string): void {
  try { sessionStorage.setItem(TOKEN_STORAGE_KEY, token); } catch { /* private mode: keep it in memory only */ }
}

/** Takes the token from the address (then removes it there) or from this tab's storage. */
export function takeToken(): string | undefined {
  const params = new URLSearchParams(location.search);
  const fromAddress = params.get('token');
  if (!fromAddress) return readStoredToken();
  storeToken(fromAddress);
  params.delete('token');
  const rest = params.toString();
  history.replaceState(history.state, '', `${location.pathname}${rest ? `?${rest}` : ''}${location.hash}`);
  return fromAddress;
}

async function readEnvelope<T>(response: Response): Promise<T> {
  const bytes = new Uint8Array(await response.arrayBuffer());
  let envelope: Envelope<T>;
  try {
    envelope = decodePayload<Envelope<T>>(bytes);
  } catch {
    const text = new TextDecoder().decode(bytes.subarray(0, 200)).trim();
    throw new Error(`The local server answered ${response.status} ${response.statusText}${text ? `: ${text}` : ''}`);
  }
  if (!envelope.ok) throw new Error(envelope.error?.message || 'The local server reported an unnamed error');
  return envelope.result;
}

export function createHttpApi(token: string): OffstateApi {
  const call = async <T>(method: string, args: unknown[]): Promise<T> => {
    const response = await fetch(`/api/call/${method}`, {
      method: 'POST',
      headers: { [TOKEN_HEADER]: token, 'Content-Type': 'application/json' },
      body: JSON.stringify({ args }),
    });
    return readEnvelope<T>(response);
  };

  const listeners = new Set<(event: ProgressEvent) => void>();
  let source: EventSource | undefined;
  const openEvents = () => {
    source = new EventSource(`/api/events?token=${encodeURIComponent(token)}`);
    source.onmessage = (message) => {
      let event: ProgressEvent;
      try { event = JSON.parse(message.data) as ProgressEvent; } catch { return; }
      for (const listener of [...listeners]) listener(event);
    };
  };

  return {
    getInfo: () => call('getInfo', []),
    listLots: () => call('listLots', []),
    listWafers: (lot) => call('listWafers', [lot]),
    getWafer: (lot, wafer) => call('getWafer', [lot, wafer]),
    analyzeLot: (lot) => call('analyzeLot', [lot]),
    importFile: (path) => call('importFile', [path]),
    async importBytes(name: string, data: Uint8Array): Promise<ImportResult> {
      const response = await fetch(`/api/upload?name=${encodeURIComponent(name)}`, {
        method: 'POST',
        headers: { [TOKEN_HEADER]: token, 'Content-Type': 'application/octet-stream' },
        body: data as Uint8Array<ArrayBuffer>,
      });
      return readEnvelope<ImportResult>(response);
    },
    exportFlaggedCsv: (lot) => call('exportFlaggedCsv', [lot]),
    cancelJob: (jobId) => call('cancelJob', [jobId]),
    previewImport: (path, mapping) => call('previewImport', mapping === undefined ? [path] : [path, mapping]),
    previewBytes: (name, headBase64, mapping) => call('previewBytes', mapping === undefined ? [name, headBase64] : [name, headBase64, mapping]),
    listMappings: () => call('listMappings', []),
    saveMapping: (name, mapping) => call('saveMapping', [name, mapping]),
    getLotColumn: (lot, param) => call('getLotColumn', [lot, param]),
    getSettings: () => call('getSettings', []),
    saveSettings: (settings) => call('saveSettings', [settings]),
    getFaEdits: (lot) => call('getFaEdits', [lot]),
    saveFaEdits: (lot, edits) => call('saveFaEdits', [lot, edits]),
    listDatabases: () => call('listDatabases', []),
    openDatabase: (path) => call('openDatabase', [path]),
    onProgress(listener) {
      listeners.add(listener);
      if (!source) openEvents();
      return () => {
        listeners.delete(listener);
        if (listeners.size === 0 && source) { source.close(); source = undefined; }
      };
    },
  };
}
