/**
 * Builds the workbench renderer into out/renderer. One build serves both hosts: the Electron window
 * (custom app scheme) and the loopback HTTP shell, so paths are relative and nothing is inlined as a
 * data: URL or inline script (the CSP allows scripts and styles from 'self' only).
 */
import { defineConfig } from 'vite';
import vue from '@vitejs/plugin-vue';
import { fileURLToPath } from 'node:url';

const here = fileURLToPath(new URL('.', import.meta.url));

export default defineConfig({
  root: here,
  base: './',
  plugins: [vue()],
  logLevel: 'warn',
  build: {
    outDir: fileURLToPath(new URL('../out/renderer', import.meta.url)),
    emptyOutDir: true,
    assetsInlineLimit: 0,
    cssCodeSplit: false,
    sourcemap: false,
    target: 'es2022',
    chunkSizeWarningLimit: 1500,
  },
});
