// The one web worker the editor needs: our language has no language service of its own.
import 'monaco-editor/editor/editor.worker.js';
