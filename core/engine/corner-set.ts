/**
 * The corners a bus is checked at (docs/design.md §6.3): the project's corners as defined, or silicon
 * corners crossed with board corners. A corner's silicon is its driver strength, edge rate, rail, Cin
 * and Tco; its board is its Dk and width change (etch). Names say which combination a result is for.
 */
import { InputError } from '../errors.js';
import type { BusDefinition, Corner, ProjectData } from '../project/model.js';

/** The combination of one corner's silicon with another's board. */
export function combineCorners(silicon: Corner, board: Corner): Corner {
  if (silicon.name === board.name) return silicon;
  return { ...silicon, name: `${silicon.name} silicon / ${board.name} board`, dk: board.dk, widthDelta: board.widthDelta };
}

/** The corners the nets of `bus` are checked at. Errors name the bus and the unknown corner. */
export function busCorners(project: Pick<ProjectData, 'corners'>, bus: BusDefinition): Corner[] {
  const pairing = bus.cornerPairing ?? 'fixed';
  if (pairing === 'fixed') return project.corners;
  if (pairing === 'cross') return project.corners.flatMap((s) => project.corners.map((b) => combineCorners(s, b)));
  const byName = new Map(project.corners.map((c) => [c.name, c]));
  return pairing.map((p, i) => {
    const s = byName.get(p.silicon);
    const b = byName.get(p.board);
    if (!s) throw new InputError(`bus ${bus.name} corner pairing ${i + 1}`, `silicon corner "${p.silicon}" is not in the project`);
    if (!b) throw new InputError(`bus ${bus.name} corner pairing ${i + 1}`, `board corner "${p.board}" is not in the project`);
    return combineCorners(s, b);
  });
}

/** The project as the nets of `bus` see it: its corners replaced by the bus's corner set. */
export function projectForBus(project: ProjectData, bus: BusDefinition): ProjectData {
  const corners = busCorners(project, bus);
  return corners === project.corners ? project : { ...project, corners };
}
