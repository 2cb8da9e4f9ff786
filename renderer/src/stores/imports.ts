/** Length-report import: preview first, apply only a preview without errors. */
import { defineStore } from 'pinia';
import { ref, shallowRef } from 'vue';
import type { ImportPreview } from '../../../core/contract/api.js';
import { api, messageOf } from '../api/client.js';

export const useImportStore = defineStore('imports', () => {
  const fileName = ref('lengths.csv');
  const csvText = ref('');
  const preview = shallowRef<ImportPreview | null>(null);
  const applied = ref(false);
  const busy = ref(false);
  const error = ref<string | null>(null);

  function setSource(name: string, text: string): void {
    fileName.value = name;
    csvText.value = text;
    preview.value = null;
    applied.value = false;
    error.value = null;
  }

  async function runPreview(): Promise<void> {
    busy.value = true;
    applied.value = false;
    try {
      preview.value = await api().previewImport(fileName.value, csvText.value);
      error.value = null;
    } catch (e) {
      preview.value = null;
      error.value = messageOf(e);
    } finally {
      busy.value = false;
    }
  }

  /** Returns true when the lengths were written. */
  async function apply(): Promise<boolean> {
    busy.value = true;
    try {
      const result = await api().applyImport(fileName.value, csvText.value);
      preview.value = result;
      applied.value = result.errors.length === 0;
      error.value = null;
      return applied.value;
    } catch (e) {
      error.value = messageOf(e);
      return false;
    } finally {
      busy.value = false;
    }
  }

  return { fileName, csvText, preview, applied, busy, error, setSource, runPreview, apply };
});
