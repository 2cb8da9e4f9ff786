// Worker-thread entry: loads the TypeScript worker through tsx (the checkout runs without a build step).
import { register } from 'tsx/esm/api';

register();
await import('./lines-worker.ts');
