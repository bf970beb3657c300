// An esbuild plugin shared by the command line's build (scripts/build-cli.mjs) and the
// server's worker bundle (server/evaluation/worker-bundle.mjs): `nerdamer` becomes a stand-in
// that loads the real package (with its Calculus and Algebra extensions) on first use, so a
// worksheet that never needs the algebra package does not pay for loading it.
// In an ES module bundle the stand-in makes its own require(); in a CommonJS bundle it uses
// the bundle's, and the package required from the stand-in is left to Node (external).
const REQUIRE_ESM = `import { createRequire } from 'node:module';
const require = createRequire(import.meta.url);`;
const LAZY_NERDAMER = `
let loaded = null;
function load() {
  if (!loaded) {
    loaded = require('nerdamer');
    require('nerdamer/Calculus.js');
    require('nerdamer/Algebra.js');
  }
  return loaded;
}
// a function, so that nerdamer(text) works; its properties (diff, flush, ...) are read through
const lazy = new Proxy(function nerdamer() {}, {
  apply: (_t, self, args) => Reflect.apply(load(), self, args),
  get: (_t, key) => load()[key],
  has: (_t, key) => key in load(),
});
export default lazy;
`;

/** The plugin; `root` is the project folder the stand-in resolves `nerdamer` from; `format` the bundle's ('esm' or 'cjs'). */
export function lazyNerdamerPlugin(root, format = 'esm') {
  const contents = format === 'cjs' ? LAZY_NERDAMER : `${REQUIRE_ESM}${LAZY_NERDAMER}`;
  return {
    name: 'lazy-nerdamer',
    setup(b) {
      b.onResolve({ filter: /^nerdamer$/ }, (a) => (a.namespace === 'lazy-nerdamer'
        ? { path: 'nerdamer', external: true }
        : { path: 'nerdamer', namespace: 'lazy-nerdamer' }));
      b.onResolve({ filter: /^nerdamer\/(Calculus|Algebra)(\.js)?$/ }, (a) => (a.namespace === 'lazy-nerdamer'
        ? { path: a.path, external: true }
        : { path: a.path, namespace: 'lazy-nerdamer-extension' }));
      b.onLoad({ filter: /.*/, namespace: 'lazy-nerdamer' }, () => ({ contents, loader: 'js', resolveDir: root }));
      // the extensions are loaded with the package, on first use
      b.onLoad({ filter: /.*/, namespace: 'lazy-nerdamer-extension' }, () => ({ contents: '', loader: 'js' }));
    },
  };
}
