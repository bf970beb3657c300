// The worker thread's entry: the ahead-of-time build of the worker when it is current
// (worker-bundle.mjs), else the TypeScript sources. Worker threads do not inherit the
// parent's TypeScript loader hooks, so tsx is registered here for the sources.
import { currentWorkerBundle } from './worker-bundle.mjs';

const bundle = currentWorkerBundle();
if (bundle) {
  await import(bundle);
} else {
  const { register } = await import('tsx/esm/api');
  register();
  await import('./worker.ts');
}
