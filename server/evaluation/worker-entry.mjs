// The worker thread's entry: worker threads do not inherit the parent's TypeScript
// loader hooks, so register tsx here before loading the TypeScript worker.
import { register } from 'tsx/esm/api';

register();
await import('./worker.ts');
