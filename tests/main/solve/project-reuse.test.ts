/**
 * The solve service loads the project once between writes: a report asks for the waveforms of every
 * failing net in a row, and reloading the whole project for each made the report superlinear in nets.
 * Behaviour of the service, no numeric source. Board: bench/generate-board.ts (invented), 12 nets.
 */
import { describe, expect, it } from 'vitest';
import { SolveService } from '../../../main/services/solve/solve-service.js';
import { generateBoard, editOneNet } from '../../../bench/generate-board.js';
import { memoryStore } from '../../../bench/memory-store.js';

describe('project loads', () => {
  it('happen once for many waveform requests, and again after the project changed', async () => {
    const store = memoryStore(generateBoard(12));
    let loads = 0;
    const counting = { ...store, load: () => (loads++, store.load()) };
    const service = new SolveService(counting, { workers: 0, solve: { lengthWindow: false } });
    const names = store.load().nets.slice(0, 5).map((n) => n.name);
    for (const name of names) await service.netWaveforms(name);
    expect(loads).toBe(1);
    store.setProject(editOneNet(store.load(), 2, 1e-4)); // a write: the next request must see it
    const after = await service.netWaveforms(names[2]);
    expect(loads).toBe(2);
    expect(after.net).toBe(names[2]);
  });
});
