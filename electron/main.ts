// The desktop shell: one window showing the built renderer from the app:// custom protocol, the
// service behind IPC, heavy work in worker threads. Started by `npm start` where Electron exists.

import { app, BrowserWindow, Menu, net, protocol, dialog, type WebContents } from 'electron';
import { join, normalize, sep } from 'node:path';
import { mkdirSync } from 'node:fs';
import { pathToFileURL } from 'node:url';
import { OffstateService } from '../src/node/service';
import { demoLotPath, projectRoot, uiDir } from '../src/node/paths';
import { registerIpc } from './ipc';
import { APP_SCHEME, hardenContents, hardenSession, secureWebPreferences } from './security';

protocol.registerSchemesAsPrivileged([{ scheme: APP_SCHEME, privileges: { standard: true, secure: true, supportFetchAPI: true } }]);

if (!app.requestSingleInstanceLock()) app.quit();

let mainWindow: BrowserWindow | undefined;
const contents = (): WebContents | undefined => mainWindow?.webContents;

async function start(): Promise<void> {
  hardenSession();
  const root = uiDir();
  protocol.handle(APP_SCHEME, (request) => {
    const url = new URL(request.url);
    const relative = url.pathname === '/' ? 'index.html' : decodeURIComponent(url.pathname.slice(1));
    const file = normalize(join(root, relative));
    if (url.host !== 'app' || !file.startsWith(root + sep)) return new Response('Not found', { status: 404 });
    return net.fetch(pathToFileURL(file).href);
  });
  const dataDir = join(app.getPath('userData'));
  mkdirSync(dataDir, { recursive: true });
  const dbPath = process.env.OFFSTATE_DB ?? join(dataDir, 'offstate.sqlite');
  const service = new OffstateService({
    dbPath,
    mode: 'desktop',
    workerUrl: pathToFileURL(join(projectRoot(), 'dist', 'node', 'worker.mjs')),
    nativeBinding: process.env.OFFSTATE_SQLITE_BINDING,
    recentFile: join(dataDir, 'recent-databases.json'),
    warmAnalysis: true,
  });
  registerIpc(service, contents);
  if (process.argv.includes('--demo')) {
    await service.importFile(demoLotPath()).catch((error: Error) => dialog.showErrorBox('Offstate', error.message));
  }
  const importChosen = async () => {
    const choice = await dialog.showOpenDialog({
      title: 'Import per-die measurements',
      properties: ['openFile', 'multiSelections'],
      filters: [{ name: 'Per-die data', extensions: ['csv', 'tsv', 'txt'] }, { name: 'All files', extensions: ['*'] }],
    });
    for (const path of choice.canceled ? [] : choice.filePaths) {
      // The view refreshes on the import job's "done" progress event.
      await service.importFile(path).catch((error: Error) => dialog.showErrorBox('Import failed', error.message));
    }
  };
  const openChosenDatabase = async () => {
    const choice = await dialog.showOpenDialog({ title: 'Open an Offstate database', properties: ['openFile', 'promptToCreate'], filters: [{ name: 'Offstate database', extensions: ['sqlite', 'db'] }] });
    if (choice.canceled || !choice.filePaths[0]) return;
    try {
      await service.openDatabase(choice.filePaths[0]);
      mainWindow?.webContents.reload();
    } catch (error) {
      dialog.showErrorBox('Database not opened', (error as Error).message);
    }
  };
  Menu.setApplicationMenu(Menu.buildFromTemplate([
    { label: 'File', submenu: [
      { label: 'Import…', accelerator: 'CmdOrCtrl+O', click: () => void importChosen() },
      { label: 'Open database…', accelerator: 'CmdOrCtrl+Shift+O', click: () => void openChosenDatabase() },
      { type: 'separator' }, { role: 'quit' },
    ] },
    { role: 'editMenu' }, { role: 'viewMenu' }, { role: 'windowMenu' },
  ]));
  mainWindow = new BrowserWindow({
    width: 1500, height: 950, title: 'Offstate', show: false,
    webPreferences: secureWebPreferences(join(projectRoot(), 'dist', 'electron', 'preload.cjs')),
  });
  hardenContents(mainWindow.webContents);
  mainWindow.once('ready-to-show', () => mainWindow?.show());
  await mainWindow.loadURL(`${APP_SCHEME}://app/index.html`);
  app.on('window-all-closed', () => { service.close(); app.quit(); });
}

app.on('web-contents-created', (_event, wc) => hardenContents(wc));
app.on('second-instance', () => { mainWindow?.focus(); });
app.whenReady().then(start).catch((error: Error) => {
  dialog.showErrorBox('Offstate could not start', error.message);
  app.quit();
});
