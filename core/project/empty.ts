/** What `slackline new` writes: a named project with no stackup, parts, buses or nets yet. */
import type { Corner, ProjectData } from './model.js';

/**
 * Starting corners for a new project: slow/typical/fast multipliers for the user to replace with the
 * spread of their own parts and fabricator (starting values, not from a standard).
 */
export const STARTING_CORNERS: readonly Corner[] = [
  { name: 'slow', driverStrength: 1.15, edgeRate: 1.3, dk: 1.05, widthDelta: -12.7e-6, rail: 0.95, cin: 1.15, tco: 'max' },
  { name: 'typical', driverStrength: 1, edgeRate: 1, dk: 1, widthDelta: 0, rail: 1, cin: 1, tco: 'typ' },
  { name: 'fast', driverStrength: 0.85, edgeRate: 0.75, dk: 0.95, widthDelta: 12.7e-6, rail: 1.05, cin: 0.85, tco: 'min' },
];

export function emptyProject(name: string): ProjectData {
  return {
    info: { name, boardRevision: '', description: '', guardBand: 25e-12, settleBand: 0.05 },
    stackup: { name: '', layers: [] },
    parts: [],
    buses: [],
    nets: [],
    corners: STARTING_CORNERS.map((c) => ({ ...c })),
  };
}
