/**
 * Child for exit-status.test.ts: runs work that never settles (a promise nobody resolves, as when a
 * worker exits without answering) under the CLI's guard, the way bin/slackline.mjs awaits main().
 */
import { guardedRun } from '../../../main/cli/index.js';

process.exitCode = await guardedRun(['check'], { out: (t) => process.stdout.write(`${t}\n`), err: (t) => process.stderr.write(`${t}\n`) }, () => new Promise<number>(() => {}));
