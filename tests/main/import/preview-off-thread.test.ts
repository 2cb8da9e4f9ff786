/**
 * A large import preview runs on a worker thread: the calling thread keeps turning its event loop
 * (a host keeps answering requests) and the preview equals the in-thread one.
 */
import { describe, expect, it } from 'vitest';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { previewImportOffThread } from '../../../main/services/project/import-preview.js';
import { lengthReportCsv, syntheticProject } from '../../../fixtures/lengths/synthetic.js';
import { makeTempDir } from '../db/temp-files.js';

describe('import preview off the calling thread', () => {
  it('leaves the event loop free while it runs and gives the same preview', async () => {
    const temp = makeTempDir('slackline-preview-');
    try {
      const data = syntheticProject(400, 10);
      const path = temp.file('p.slackline');
      ProjectStore.create(path, data).close();
      const store = ProjectStore.open(path);
      try {
        const csv = lengthReportCsv(data, 1.2); // about 140 kB; inThreadChars 0 forces the worker
        const pending = previewImportOffThread(store, 'r.csv', csv, { inThreadChars: 0 });
        let settled = false;
        void pending.then(() => (settled = true), () => (settled = true));
        // Ten turns of the event loop happen while the preview is still pending: with the preview on
        // this thread (the old behaviour) no turn could run before it finished.
        let turns = 0;
        for (let i = 0; i < 10; i += 1) await new Promise((r) => setImmediate(r)).then(() => (turns += settled ? 0 : 1));
        expect(turns).toBe(10);
        const preview = await pending;
        expect(preview).toStrictEqual(store.previewImport('r.csv', csv));
        expect(preview.counts.changed).toBe(4000);
      } finally {
        store.close();
      }
    } finally {
      temp.remove();
    }
  });

  it('reports the preview errors as the in-thread preview does, and previews in-thread when the worker cannot start', async () => {
    const temp = makeTempDir('slackline-preview-');
    try {
      const path = temp.file('p.slackline');
      ProjectStore.create(path, syntheticProject(2, 2)).close();
      const store = ProjectStore.open(path);
      try {
        const preview = await previewImportOffThread(store, 'r.csv', 'net,layer,length\nNET0,L1_TOP,0mm\n', { inThreadChars: 0 });
        expect(preview.errors).toEqual([expect.stringMatching(/^r\.csv line 2 column 3 \(length\)/)]);
        // A build that lacks the worker file still previews (in the calling thread).
        const fallback = await previewImportOffThread(store, 'r.csv', 'net,layer,length\nNET0,L1_TOP,0mm\n', { inThreadChars: 0, entry: new URL('file:///nonexistent-worker.mjs') });
        expect(fallback).toStrictEqual(preview);
      } finally {
        store.close();
      }
    } finally {
      temp.remove();
    }
  });
});
