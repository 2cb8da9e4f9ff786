/**
 * Child process for the fault-injection suite: runs COUNT operations of one kind on a project, each
 * as a fresh open, like separate command-line runs. Prints one JSON line per operation:
 * {"op","i","ok":true} or {"op","i","ok":false,"kind":"input"|"crash","message"}.
 * Usage: node --import tsx/esm tests/fault/project-child.ts PROJECT OP COUNT
 *   OP import: sets segment 1 of NET<i> to (10 + i) mm through a one-row length report
 *   OP edit:   sets the width of segment 2 of NET<i> to (100 + i) um
 *   OP check:  solves the whole board in this thread (stores its results)
 */
import { writeSync } from 'node:fs';
import { InputError } from '../../core/errors.js';
import { openProjectServices } from '../../main/services/compose.js';

const [projectPath, op, countText] = process.argv.slice(2);
const count = Number(countText);

async function once(i: number): Promise<void> {
  const services = openProjectServices(projectPath, { store: { author: `child-${op}` }, solve: { workers: 0 } });
  try {
    if (op === 'import') {
      const preview = services.store.applyImport(`r${i}.csv`, `net,layer,length_mm\nNET${i},L1_TOP,${10 + i}\n`);
      if (preview.errors.length > 0) throw new InputError(`import ${i}`, preview.errors.join('; '));
    } else if (op === 'edit') {
      const net = services.store.load().nets.find((n) => n.name === `NET${i}`)!;
      const segment = net.elements[1];
      if (segment.kind !== 'segment') throw new Error('fixture: element 2 is not a segment');
      services.store.updateNetElement(net.name, 1, { ...segment, width: (100 + i) * 1e-6 });
    } else if (op === 'check') {
      await services.solver.solveBoard({});
    } else {
      throw new Error(`unknown op ${op}`);
    }
  } finally {
    await services.close();
  }
}

for (let i = 0; i < count; i += 1) {
  try {
    await once(i);
    writeSync(1, `${JSON.stringify({ op, i, ok: true })}\n`);
  } catch (error) {
    const kind = error instanceof InputError ? 'input' : 'crash';
    writeSync(1, `${JSON.stringify({ op, i, ok: false, kind, message: (error as Error).message })}\n`);
  }
}
