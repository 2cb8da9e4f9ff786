/**
 * IBIS files of the open project and the parts' models (docs/ibis.md §9, docs/workbench.md "Parts"):
 * importing a file, choosing a part's model (an undoable authoring edit), and a model's curves at a
 * corner. The stored files arrive with the project as name, hash, size and summary, never their text.
 */
import { defineStore } from 'pinia';
import { computed } from 'vue';
import type { IbisFileInfo, IbisImportResult, ModelCurves } from '../../../core/contract/api.js';
import { api } from '../api/client.js';
import { useProjectStore } from './project.js';

export const useIbisStore = defineStore('ibis', () => {
  const project = useProjectStore();
  const files = computed<IbisFileInfo[]>(() => project.data?.ibisFiles ?? []);

  /** Stores the file (the services parse all of it first and refuse a malformed one whole), then reloads the project. */
  async function importFile(fileName: string, text: string): Promise<IbisImportResult> {
    const stored = await api().importIbis(fileName, text);
    await project.load();
    return stored;
  }

  /** Sets (or, with null, clears) the part's IBIS model; undoable like every authoring edit. */
  async function setPartModel(part: string, ibis: { file: string; model: string; pin?: string } | null): Promise<void> {
    await project.edit({ op: 'setPartIbis', part, ibis });
  }

  async function curves(part: string, corner: string): Promise<ModelCurves | null> {
    return api().getPartIbisCurves(part, corner);
  }

  return { files, importFile, setPartModel, curves };
});
