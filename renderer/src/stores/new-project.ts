/**
 * The new-project screen (docs/workbench.md §New project): a design file and the .ibs files it names,
 * or an empty project; every check and the creation go through the service API. After the host has
 * opened the new project the page starts again on it, so every store loads the new project.
 */
import { defineStore } from 'pinia';
import { computed, ref, shallowRef } from 'vue';
import type { NewProjectProblem, NewProjectRequest, NewProjectResult, NewProjectTarget } from '../../../core/contract/api.js';
import { ApiError, api, messageOf } from '../api/client.js';

export type NewProjectKind = 'design' | 'empty';

/** Kept for the first screen of the new project (sessionStorage lasts for this tab only). */
const CREATED_KEY = 'slackline.createdProject';

export const useNewProjectStore = defineStore('newProject', () => {
  const kind = ref<NewProjectKind>('design');
  const target = shallowRef<NewProjectTarget | null>(null);
  const targetError = ref<string | null>(null);

  const design = shallowRef<{ fileName: string; text: string } | null>(null);
  const ibisFiles = shallowRef<{ path: string; text: string }[]>([]);
  const emptyName = ref('');
  const emptyRevision = ref('');
  const fileName = ref('');

  const result = shallowRef<NewProjectResult | null>(null);
  /** A refusal that is not a design problem (file exists, bad file name), shown in the same list. */
  const refusal = shallowRef<NewProjectProblem | null>(null);
  const busy = ref(false);

  const problems = computed<NewProjectProblem[]>(() => [...(refusal.value ? [refusal.value] : []), ...(result.value?.problems ?? [])]);

  async function loadTarget(): Promise<void> {
    try {
      target.value = await api().getNewProjectTarget();
      targetError.value = null;
    } catch (e) {
      target.value = null;
      targetError.value = messageOf(e);
    }
  }

  function request(checkOnly: boolean): NewProjectRequest {
    const path = target.value?.kind === 'folder' ? fileName.value.trim() || undefined : undefined;
    if (kind.value === 'design') {
      const d = design.value ?? { fileName: 'design.yaml', text: '' };
      return { design: { fileName: d.fileName, text: d.text, ibisFiles: ibisFiles.value }, checkOnly, ...(checkOnly ? {} : { path }) };
    }
    return { empty: { name: emptyName.value, boardRevision: emptyRevision.value }, checkOnly, ...(checkOnly ? {} : { path }) };
  }

  function asProblem(e: unknown): NewProjectProblem {
    const where = e instanceof ApiError ? e.where : null;
    const message = messageOf(e);
    return { file: 'new project', line: null, column: null, field: where, message: where && message.startsWith(`${where}: `) ? message.slice(where.length + 2) : message };
  }

  /** The file name offered for a project called `name` (the user may change it). */
  function suggestFileName(name: string): void {
    const stem = name.trim().replace(/[^A-Za-z0-9 ._()+-]+/g, '-').replace(/^[^A-Za-z0-9]+/, '').replace(/\s+/g, '-');
    if (stem) fileName.value = `${stem}.slackline`;
  }

  async function check(): Promise<void> {
    busy.value = true;
    refusal.value = null;
    try {
      result.value = await api().createProject(request(true));
      if (result.value.outline && !fileName.value) suggestFileName(result.value.outline.name);
    } catch (e) {
      result.value = null;
      refusal.value = asProblem(e);
    } finally {
      busy.value = false;
    }
  }

  async function setDesign(name: string, text: string): Promise<void> {
    design.value = { fileName: name, text };
    fileName.value = '';
    await check();
  }

  async function addIbisFiles(files: { path: string; text: string }[]): Promise<void> {
    const names = new Set(files.map((f) => f.path));
    ibisFiles.value = [...ibisFiles.value.filter((f) => !names.has(f.path)), ...files];
    if (design.value) await check();
  }

  function removeIbisFile(path: string): void {
    ibisFiles.value = ibisFiles.value.filter((f) => f.path !== path);
    if (design.value) void check();
  }

  /** Creates the project; on success the page starts again on it (every store loads the new project). */
  async function create(): Promise<void> {
    busy.value = true;
    refusal.value = null;
    try {
      const answer = await api().createProject(request(false));
      result.value = answer;
      if (answer.outcome === 'created') {
        try {
          sessionStorage.setItem(CREATED_KEY, JSON.stringify({ name: answer.outline?.name ?? '', path: answer.path ?? '' }));
        } catch {
          /* private mode: no note after the reload */
        }
        // A reload, not a change of place first: a navigation just before it would be cut short.
        // The new page starts on the overview (App.vue reads the note).
        window.location.reload();
      }
    } catch (e) {
      refusal.value = asProblem(e);
    } finally {
      busy.value = false;
    }
  }

  return {
    kind, target, targetError, design, ibisFiles, emptyName, emptyRevision, fileName, result, refusal, busy, problems,
    loadTarget, check, setDesign, addIbisFiles, removeIbisFile, create, suggestFileName,
  };
});

/** The project just created in this tab ("created … in …"), read once after the reload. */
export function takeCreatedNote(): { name: string; path: string } | null {
  try {
    const text = sessionStorage.getItem(CREATED_KEY);
    sessionStorage.removeItem(CREATED_KEY);
    return text ? (JSON.parse(text) as { name: string; path: string }) : null;
  } catch {
    return null;
  }
}
