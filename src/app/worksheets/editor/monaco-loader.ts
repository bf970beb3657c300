import type { Monaco } from './monaco-setup';

let loading: Promise<Monaco> | null = null;

// Monaco reads its worker factory from self.MonacoEnvironment (typed by monaco-editor).
type WithEnvironment = { MonacoEnvironment?: { getWorker(workerId: string, label: string): Worker } };

/** Load the editor once: worker factory, its style sheet (bundled as monaco.css), then the code. */
export function loadMonaco(): Promise<Monaco> {
  loading ??= (async () => {
    (self as unknown as WithEnvironment).MonacoEnvironment = {
      getWorker: () => new Worker(new URL('./editor.worker', import.meta.url), { type: 'module' }),
    };
    if (!document.querySelector('link[data-monaco-css]')) {
      const link = document.createElement('link');
      link.rel = 'stylesheet';
      link.href = 'monaco.css';
      link.dataset['monacoCss'] = '';
      const loaded = new Promise<void>((resolve) => {
        link.onload = () => resolve();
        link.onerror = () => resolve();
      });
      document.head.appendChild(link);
      await loaded;
    }
    const m = await import('./monaco-setup');
    return m.monaco;
  })();
  return loading;
}
