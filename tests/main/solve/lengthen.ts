/** Test helper: lengthens net `name`'s first segment in a stored project by `delta` metres. */
import type { ProjectStore } from '../../../main/services/project/project-store.js';

export function lengthen(store: ProjectStore, name: string, delta: number): void {
  const net = store.load().nets.find((n) => n.name === name)!;
  const index = net.elements.findIndex((e) => e.kind === 'segment');
  const segment = net.elements[index];
  if (segment.kind !== 'segment') throw new Error('no segment');
  store.updateNetElement(name, index, { ...segment, length: segment.length + delta });
}
