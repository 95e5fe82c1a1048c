// Builds the bench page (web/) into dist/web: one script and one style sheet with hashed names,
// every asset local, so `benchproof serve` fetches nothing from the internet.
import { defineConfig } from 'vite';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('.', import.meta.url));

export default defineConfig({
  root,
  base: '/',
  logLevel: 'warn',
  build: {
    outDir: fileURLToPath(new URL('../dist/web', import.meta.url)),
    emptyOutDir: true,
    sourcemap: false,
    // No inline module-preload helper or data: URLs: the page's CSP allows scripts from itself only.
    modulePreload: false,
    assetsInlineLimit: 0,
    chunkSizeWarningLimit: 200,
  },
});
