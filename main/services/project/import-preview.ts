/**
 * Previews a length import on a worker thread, so a host serving requests (the loopback shell, the
 * desktop window) keeps answering while a large report is read and compared (docs/reliability.md §7).
 * The preview is the same as ProjectStore.previewImport's; small reports are previewed in the calling
 * thread, where starting a worker would cost more than the work.
 */
import { startWorker } from '../worker-exec-argv.js';
import { InputError } from '../../../core/errors.js';
import type { ImportPreview } from '../../../core/contract/api.js';
import type { ProjectStore } from './project-store.js';

/** Reports up to this many characters are previewed in the calling thread (a few thousand rows). */
export const IN_THREAD_PREVIEW_CHARS = 256 * 1024;

export function previewImportOffThread(
  store: ProjectStore, fileName: string, text: string,
  options: { allowRepeatedRows?: boolean; entry?: URL; inThreadChars?: number } = {},
): Promise<ImportPreview> {
  if (text.length <= (options.inThreadChars ?? IN_THREAD_PREVIEW_CHARS)) {
    return Promise.resolve(store.previewImport(fileName, text, options));
  }
  return new Promise((resolve, reject) => {
    const worker = startWorker(options.entry ?? new URL('./import-preview-worker.mjs', import.meta.url), {
      workerData: { path: store.path, fileName, text, allowRepeatedRows: options.allowRepeatedRows === true },
    });
    let answered = false;
    let started = false;
    worker.once('online', () => (started = true));
    worker.once('message', (m: { ok: true; preview: ImportPreview } | { ok: false; input: boolean; message: string; where: string; reason: string }) => {
      answered = true;
      if (m.ok) resolve(m.preview);
      else reject(m.input ? new InputError(m.where, m.reason) : new Error(m.message));
    });
    worker.once('error', (error) => {
      answered = true;
      // A build without the worker's file: preview here rather than not at all.
      if (!started || /MODULE_NOT_FOUND$/.test((error as { code?: string }).code ?? '')) {
        try {
          resolve(store.previewImport(fileName, text, options));
        } catch (inThread) {
          reject(inThread);
        }
        return;
      }
      reject(error);
    });
    worker.once('exit', (code) => {
      if (!answered) reject(new Error(`the import preview worker stopped (status ${code}) without an answer`));
    });
  });
}
