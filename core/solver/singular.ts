/**
 * Says where a nodal matrix is singular: the node whose unknown lost its pivot and the elements
 * attached to it, so a floating node or a loop of ideal elements can be found in the net file.
 */
import { type Circuit, GROUND, elementLabel } from '../circuit/types.js';

/** "at node "mid" (elements[2] (capacitor mid->gnd), elements[3] (line mid->rx))". */
export function singularPlace(names: readonly string[], column: number, circuit?: Circuit): string {
  if (column < 0 || column >= names.length) return 'at an internal branch (a loop of lines or inductors with no resistance)';
  const node = names[column];
  const attached = (circuit?.elements ?? [])
    .map((element, index) => ({ element, index }))
    .filter(({ element }) => element.a === node || (element.kind === 'via' ? GROUND === node : element.b === node))
    .map(({ element, index }) => elementLabel(index, element));
  const list = attached.length > 0 ? ` (${attached.slice(0, 6).join(', ')}${attached.length > 6 ? ', ...' : ''})` : '';
  return `at node "${node}"${list}`;
}
