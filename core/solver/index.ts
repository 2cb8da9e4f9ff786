export { simulateEdge, simulateNet, chooseStep, chooseStop, rampStart, WaveformBuffers } from './transient.js';
export type { Edge, Waveform, SimulationOptions } from './transient.js';
export { launchStep, reflection } from './closed-form.js';
