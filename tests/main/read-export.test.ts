/**
 * AppService.readExport (main/services/api/app-service.ts): the browser shell's download links read
 * back report files, and only those this session's exports wrote — the method must not become a way
 * to read any file the server process can.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { AppService } from '../../main/services/api/app-service.js';
import { InputError } from '../../core/errors.js';

const dir = mkdtempSync(join(tmpdir(), 'slackline-export-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function service(): AppService {
  const unused = () => { throw new Error('not used'); };
  return new AppService({
    project: {
      path: join(dir, 'x.slackline'), load: unused, updateInfo: unused, updateStackup: unused, upsertPart: unused, updateBus: unused,
      updateNetElement: unused, updateCorners: unused, previewImport: unused, applyImport: unused,
    },
    solve: { solveBoard: unused, solveNet: unused, freshResults: () => null, latestSolveAt: () => null, netWaveforms: unused },
    layerProperties: () => [],
    exportReport: async () => {
      // Invented report bytes; the PDF header per ISO 32000-1 §7.5.2.
      writeFileSync(join(dir, 'margins.pdf'), '%PDF-1.7 invented');
      writeFileSync(join(dir, 'margins.csv'), 'net,setup_ps\nDQ0,82\n');
      return { files: [join(dir, 'margins.pdf'), join(dir, 'margins.csv')] };
    },
  });
}

describe('readExport', () => {
  it('returns an exported file by name, media type and bytes', async () => {
    const api = service();
    const { files } = await api.exportReport({ formats: ['pdf', 'csv'] });
    const pdf = await api.readExport(files[0]);
    expect(pdf.name).toBe('margins.pdf');
    expect(pdf.mime).toBe('application/pdf'); // IANA media type of PDF (RFC 8118)
    expect(Buffer.from(pdf.base64, 'base64').toString('latin1')).toBe('%PDF-1.7 invented');
    expect((await api.readExport(files[1])).mime).toBe('text/csv'); // RFC 4180
  });

  it('refuses a file no export of this session wrote, naming it', async () => {
    const api = service();
    writeFileSync(join(dir, 'secret.txt'), 'not a report');
    await expect(api.readExport(join(dir, 'secret.txt'))).rejects.toBeInstanceOf(InputError);
    await expect(api.readExport(join(dir, 'margins.pdf'))).rejects.toThrow(/margins\.pdf.*not one this session exported/);
    await api.exportReport({ formats: ['pdf'] });
    // A path spelled differently but naming an exported file is the same file.
    expect((await api.readExport(join(dir, '.', 'margins.pdf'))).name).toBe('margins.pdf');
  });
});
