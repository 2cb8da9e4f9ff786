/** The open project as the services report it, and every edit of it. */
import { defineStore } from 'pinia';
import { computed, ref, shallowRef } from 'vue';
import type { ProjectSummary, LayerProperties, LayerTargetRequest, LayerTargetResult, ProjectEdit, EditHistory, LayerFieldMap } from '../../../core/contract/api.js';
import type { Stackup, PartModel, NetElement, NetDefinition, ProjectInfo, Corner, BusDefinition, Waiver } from '../../../core/project/model.js';
import { api, messageOf } from '../api/client.js';

export const useProjectStore = defineStore('project', () => {
  // The summary is replaced whole after every edit; shallowRef avoids deep proxies of large net lists.
  const summary = shallowRef<ProjectSummary | null>(null);
  const loading = ref(false);
  const error = ref<string | null>(null);

  const data = computed(() => summary.value?.data ?? null);
  /** Why the project is open read-only, or null; every edit control is off while it is set (docs/workbench.md, "Read-only projects"). */
  const readOnly = computed(() => summary.value?.readOnly ?? null);
  const netsByName = computed(() => new Map((data.value?.nets ?? []).map((net) => [net.name, net])));

  async function load(): Promise<void> {
    loading.value = true;
    try {
      summary.value = await api().getProject();
      error.value = null;
      await loadHistory();
    } catch (e) {
      error.value = messageOf(e);
    } finally {
      loading.value = false;
    }
  }

  function net(name: string): NetDefinition | undefined {
    return netsByName.value.get(name);
  }

  /**
   * Edits throw (the calling view shows the message beside the field); success replaces the summary.
   * `whenStored` runs as soon as the services answer, before the page re-renders with the new project,
   * so the requests it starts overlap that re-render (docs/workbench.md, "Time from an edit to the new numbers").
   */
  async function updateNetElement(netName: string, index: number, element: NetElement, whenStored?: () => void): Promise<void> {
    const next = await api().updateNetElement(netName, index, element);
    whenStored?.();
    summary.value = next;
  }

  async function updateStackup(stackup: Stackup): Promise<void> {
    summary.value = await api().updateStackup(stackup);
  }

  async function layerFieldMap(stackup: Stackup, layer: string, width: number): Promise<LayerFieldMap> {
    return api().layerFieldMap(stackup, layer, width);
  }

  async function previewStackup(stackup: Stackup): Promise<LayerProperties[]> {
    return api().previewStackup(stackup);
  }

  /** Width for a target Z0, gap for a target Zdiff, on a layer of the stackup as edited (nothing saved). */
  async function solveLayerTarget(stackup: Stackup, request: LayerTargetRequest): Promise<LayerTargetResult> {
    return api().solveLayerTarget(stackup, request);
  }

  async function upsertPart(part: PartModel): Promise<void> {
    summary.value = await api().upsertPart(part);
  }

  async function updateInfo(patch: Partial<ProjectInfo>): Promise<void> {
    summary.value = await api().updateInfo(patch);
  }

  /** Replaces the whole corner set (the services refuse an empty or invalid set and keep the old one). */
  async function updateCorners(corners: Corner[]): Promise<void> {
    summary.value = await api().updateCorners(corners);
  }

  /** Replaces the bus of that name: its timing numbers and allowances. */
  async function updateBus(bus: BusDefinition): Promise<void> {
    summary.value = await api().updateBus(bus);
  }

  // ---------------------------------------------------------------- authoring (docs/design-file.md §9)

  /** What undo and redo would restore, newest first; refreshed after every authoring call. */
  const history = ref<EditHistory>({ undo: [], redo: [] });

  async function loadHistory(): Promise<void> {
    try {
      history.value = await api().getEditHistory();
    } catch {
      // A host without authoring: nothing to undo.
      history.value = { undo: [], redo: [] };
    }
  }

  async function authored(call: Promise<ProjectSummary>): Promise<void> {
    summary.value = await call;
    await loadHistory();
  }

  /** One authoring edit (create, rename, delete; insert or remove an element; a termination). Throws the service's refusal. */
  async function edit(change: ProjectEdit): Promise<void> {
    await authored(api().editProject(change));
  }

  async function applySuggestedTermination(netName: string): Promise<void> {
    await authored(api().applySuggestedTermination(netName));
  }

  /** Waives a failing or tight net / removes its waiver (docs/workbench.md, "Waivers"); both undoable. Throws the refusal. */
  async function setWaiver(netName: string, comment: string, author: string): Promise<void> {
    await authored(api().setWaiver(netName, { comment, author }));
  }

  async function removeWaiver(netName: string): Promise<void> {
    await authored(api().removeWaiver(netName));
  }

  /** The waiver of a net, or undefined. */
  function waiver(netName: string): Waiver | undefined {
    return data.value?.waivers?.find((w) => w.net === netName);
  }

  async function undo(): Promise<void> {
    await authored(api().undo());
  }

  async function redo(): Promise<void> {
    await authored(api().redo());
  }

  return {
    history, loadHistory, edit, applySuggestedTermination, undo, redo, setWaiver, removeWaiver, waiver,
    summary, loading, error, data, readOnly, load, net, updateNetElement, updateStackup, previewStackup, layerFieldMap, solveLayerTarget, upsertPart, updateInfo,
    updateCorners, updateBus,
  };
});
