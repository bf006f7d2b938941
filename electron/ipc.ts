// Every IPC handler registered in one place: the sender must be our own window on our own origin,
// and the arguments must fit the contract before they reach the service.

import { ipcMain, type IpcMainInvokeEvent, type WebContents } from 'electron';
import { API_METHODS } from '../src/shared/api';
import { validateArgs } from '../src/shared/validate';
import type { OffstateService } from '../src/node/service';
import { APP_ORIGIN } from './security';

export const CHANNEL_PREFIX = 'offstate:';

function trustedSender(event: IpcMainInvokeEvent, window: () => WebContents | undefined): boolean {
  const frame = event.senderFrame;
  return event.sender === window() && frame !== null && frame.url.startsWith(APP_ORIGIN + '/') && frame === event.sender.mainFrame;
}

export function registerIpc(service: OffstateService, window: () => WebContents | undefined): void {
  for (const method of API_METHODS) {
    ipcMain.handle(CHANNEL_PREFIX + method, async (event, ...args: unknown[]) => {
      if (!trustedSender(event, window)) throw new Error('IPC refused: the sender is not the Offstate window.');
      validateArgs(method, args);
      const fn = (service as unknown as Record<string, (...a: unknown[]) => Promise<unknown>>)[method];
      return fn.apply(service, args);
    });
  }
  service.onProgress((progress) => window()?.send(CHANNEL_PREFIX + 'progress', progress));
}
