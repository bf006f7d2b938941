// Build of the renderer (src/ui -> dist/ui). Relative asset paths (base './') so the same files
// load from the local browser-mode server and from the desktop shell. Under vitest (mode
// 'test') the project root stays the repository, so tests/ is found as usual.
import { defineConfig } from 'vite';
import vue from '@vitejs/plugin-vue';
import { fileURLToPath } from 'node:url';

const fromHere = (path: string) => fileURLToPath(new URL(path, import.meta.url));

export default defineConfig(({ mode }) => {
  if (mode === 'test') return { plugins: [vue()] };
  return {
    root: fromHere('./src/ui'),
    base: './',
    plugins: [vue()],
    // No public/ folder: every asset is imported by the code.
    publicDir: false,
    build: {
      outDir: fromHere('./dist/ui'),
      emptyOutDir: true,
      target: 'es2022',
      // Chromium supports modulepreload natively; the polyfill is not needed.
      modulePreload: { polyfill: false },
      // Keep assets as files: nothing needs a data: URL under the page's CSP.
      assetsInlineLimit: 0,
      chunkSizeWarningLimit: 1200,
    },
  };
});
