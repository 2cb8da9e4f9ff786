/**
 * Worker thread of import-preview.ts: opens the project read-only (its own connection; WAL readers
 * never wait for writers, docs/reliability.md §1), previews the report and posts the preview back.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { InputError } from '../../../core/errors.js';
import { ProjectStore } from './project-store.js';

const { path, fileName, text, allowRepeatedRows } = workerData as { path: string; fileName: string; text: string; allowRepeatedRows: boolean };
try {
  const store = ProjectStore.open(path, { readOnly: true });
  try {
    parentPort!.postMessage({ ok: true, preview: store.previewImport(fileName, text, { allowRepeatedRows }) });
  } finally {
    store.close();
  }
} catch (error) {
  const input = error instanceof InputError;
  parentPort!.postMessage({
    ok: false, input, message: (error as Error).message,
    where: input ? error.where : null, reason: input ? error.reason : null,
  });
}
