// The worksheet language (.swk) for the editor: tokens, our two themes, completion and hover.
import type * as MonacoNs from 'monaco-editor/editor';

type Monaco = typeof MonacoNs;

export const LANGUAGE_ID = 'sheetwise';
export const LIGHT_THEME = 'sheetwise-light';
export const DARK_THEME = 'sheetwise-dark';

export const KEYWORDS = [
  'param', 'integral', 'rotate', 'continue', 'compare', 'verify', 'expect', 'let', 'limit', 'note',
  'along', 'as', 'at', 'with', 'steepest',
] as const;
export const DOMAIN_WORDS = ['positive', 'negative', 'real', 'complex', 'nonzero'] as const;
const FUNCTIONS = ['exp', 'sqrt', 'log', 'sin', 'cos', 'tan', 'sinh', 'cosh', 'tanh', 'atan', 'abs', 're', 'im', 'arg', 'conj'];
const CONSTANTS = ['i', 'pi', 'e'];

/** Short descriptions shown with the keyword completions. */
const KEYWORD_HELP: Record<string, string> = {
  param: 'Declare a parameter and its domain: param k : positive',
  integral: 'A Gaussian integral with its integration variables: integral Z = exp(...) d(x, y)',
  rotate: 'Rotate a variable of an integral: rotate Z : y -> exp(-i*pi/2)*y as ZL',
  continue: 'Continue a result along a path in a parameter: continue Z : lam along 0 -> 2*i',
  compare: 'Compare two results: compare ZL with Z',
  verify: 'Check a result numerically at a parameter point: verify Z at k = 2',
  expect: 'State the expected value; a mismatch is a problem: expect Z = 2*pi/k',
  let: 'Name a derived quantity: let F = -log(Z)',
  limit: 'A limit of a result: limit Z : lam -> 0',
  note: 'Free text kept with the record: note "..."',
};

/** Names declared in a source: params, integration variables and result names. */
export interface DeclaredNames {
  params: string[];
  variables: string[];
  results: string[];
}

export function declaredNames(source: string): DeclaredNames {
  const params = new Set<string>();
  const variables = new Set<string>();
  const results = new Set<string>();
  for (const raw of source.split('\n')) {
    const line = raw.replace(/#.*$/, '');
    let m = /^\s*param\s+([A-Za-z_]\w*)/.exec(line);
    if (m) params.add(m[1]);
    m = /^\s*(?:integral|let)\s+([A-Za-z_]\w*)\s*=/.exec(line);
    if (m) results.add(m[1]);
    m = /\bas\s+([A-Za-z_]\w*)\s*$/.exec(line);
    if (m) results.add(m[1]);
    for (const d of line.matchAll(/\bd\(([^)]*)\)/g)) {
      for (const v of d[1].split(',')) if (/^\s*[A-Za-z_]\w*\s*$/.test(v)) variables.add(v.trim());
    }
  }
  return { params: [...params], variables: [...variables], results: [...results] };
}

/** One-line results by name, kept per model by the editor component, for hovers. */
export const resultHovers = new Map<string, Map<string, string>>();

let registered = false;

export function registerSheetwiseLanguage(monaco: Monaco): void {
  if (registered) return;
  registered = true;
  monaco.languages.register({ id: LANGUAGE_ID, extensions: ['.swk'], aliases: ['Sheetwise worksheet'] });
  monaco.languages.setLanguageConfiguration(LANGUAGE_ID, {
    comments: { lineComment: '#' },
    brackets: [['(', ')']],
    autoClosingPairs: [
      { open: '(', close: ')' },
      { open: '"', close: '"', notIn: ['string'] },
    ],
    surroundingPairs: [
      { open: '(', close: ')' },
      { open: '"', close: '"' },
    ],
    wordPattern: /[A-Za-z_]\w*|\d+(\.\d+)?/,
  });
  monaco.languages.setMonarchTokensProvider(LANGUAGE_ID, {
    defaultToken: '',
    keywords: [...KEYWORDS],
    domains: [...DOMAIN_WORDS],
    functions: FUNCTIONS,
    constants: CONSTANTS,
    tokenizer: {
      root: [
        [/#.*$/, 'comment'],
        [/"/, { token: 'string.quote', next: '@string' }],
        // d(x, y): the integration variables.
        [/\bd(?=\()/, { token: 'keyword.measure', next: '@measure' }],
        [
          /[A-Za-z_]\w*/,
          {
            cases: {
              '@keywords': 'keyword',
              '@domains': 'type.domain',
              '@functions': 'predefined.function',
              '@constants': 'constant',
              '@default': 'identifier',
            },
          },
        ],
        [/\d+(\.\d+)?([eE][-+]?\d+)?/, 'number'],
        [/->|[=:*\/^+\-,]/, 'operator'],
        [/[()]/, '@brackets'],
        [/\s+/, 'white'],
      ],
      string: [
        [/[^"]+/, 'string'],
        [/"/, { token: 'string.quote', next: '@pop' }],
      ],
      measure: [
        [/\(/, '@brackets'],
        [/[A-Za-z_]\w*/, 'variable.integration'],
        [/,|\s+/, 'white'],
        [/\)/, { token: '@brackets', next: '@pop' }],
        [/./, { token: 'invalid', next: '@pop' }],
      ],
    },
  });

  monaco.editor.defineTheme(LIGHT_THEME, {
    base: 'vs',
    inherit: true,
    rules: [
      { token: 'keyword', foreground: '0b4f63', fontStyle: 'bold' },
      { token: 'keyword.measure', foreground: 'b5651d', fontStyle: 'bold' },
      { token: 'variable.integration', foreground: 'b5651d', fontStyle: 'italic' },
      { token: 'type.domain', foreground: '8a4a12' },
      { token: 'predefined.function', foreground: '2b657a' },
      { token: 'constant', foreground: '6b3a0f', fontStyle: 'italic' },
      { token: 'identifier', foreground: '0d2a36' },
      { token: 'number', foreground: '2d6a4f' },
      { token: 'comment', foreground: '7a7466', fontStyle: 'italic' },
      { token: 'string', foreground: '5b4a8a' },
      { token: 'string.quote', foreground: '5b4a8a' },
      { token: 'operator', foreground: '5d6470' },
    ],
    colors: {
      'editor.background': '#fffdf9',
      'editor.foreground': '#0d2a36',
      'editorLineNumber.foreground': '#a39d8f',
      'editorLineNumber.activeForeground': '#0b4f63',
      'editor.lineHighlightBackground': '#f3efe6',
      'editor.selectionBackground': '#baeaff',
      'editorCursor.foreground': '#b5651d',
      'editorGutter.background': '#fffdf9',
      'editorError.foreground': '#9c2f24',
      'editorWarning.foreground': '#b5651d',
    },
  });
  monaco.editor.defineTheme(DARK_THEME, {
    base: 'vs-dark',
    inherit: true,
    rules: [
      { token: 'keyword', foreground: '97cee6', fontStyle: 'bold' },
      { token: 'keyword.measure', foreground: 'e8a868', fontStyle: 'bold' },
      { token: 'variable.integration', foreground: 'e8a868', fontStyle: 'italic' },
      { token: 'type.domain', foreground: 'f0c08a' },
      { token: 'predefined.function', foreground: '7cb3ca' },
      { token: 'constant', foreground: 'f3d2ad', fontStyle: 'italic' },
      { token: 'identifier', foreground: 'e9e4d8' },
      { token: 'number', foreground: '8fd1ad' },
      { token: 'comment', foreground: '9a9383', fontStyle: 'italic' },
      { token: 'string', foreground: 'c6b8ef' },
      { token: 'string.quote', foreground: 'c6b8ef' },
      { token: 'operator', foreground: 'b6bcc6' },
    ],
    colors: {
      'editor.background': '#12232b',
      'editor.foreground': '#e9e4d8',
      'editorLineNumber.foreground': '#6e7f86',
      'editorLineNumber.activeForeground': '#97cee6',
      'editor.lineHighlightBackground': '#1a313b',
      'editor.selectionBackground': '#1c596d',
      'editorCursor.foreground': '#e8a868',
      'editorGutter.background': '#12232b',
      'editorError.foreground': '#ff8a7a',
      'editorWarning.foreground': '#e8a868',
    },
  });

  monaco.languages.registerCompletionItemProvider(LANGUAGE_ID, {
    provideCompletionItems(model, position) {
      const word = model.getWordUntilPosition(position);
      const range = {
        startLineNumber: position.lineNumber,
        endLineNumber: position.lineNumber,
        startColumn: word.startColumn,
        endColumn: word.endColumn,
      };
      const kinds = monaco.languages.CompletionItemKind;
      const names = declaredNames(model.getValue());
      const before = model.getLineContent(position.lineNumber).slice(0, word.startColumn - 1);
      const atStart = /^\s*$/.test(before);
      const suggestions: MonacoNs.languages.CompletionItem[] = [];
      const seen = new Set<string>();
      const add = (label: string, kind: MonacoNs.languages.CompletionItemKind, detail: string, sort: string) => {
        if (seen.has(label)) return;
        seen.add(label);
        suggestions.push({ label, kind, detail, insertText: label, range, sortText: `${sort}${label}` });
      };
      if (/:\s*$/.test(before) && /^\s*param\b/.test(before)) {
        for (const d of DOMAIN_WORDS) add(d, kinds.EnumMember, 'domain', '0');
        return { suggestions };
      }
      for (const k of KEYWORDS) {
        if (atStart || !KEYWORD_HELP[k]) add(k, kinds.Keyword, KEYWORD_HELP[k] ?? 'keyword', atStart ? '0' : '3');
      }
      for (const r of names.results) add(r, kinds.Variable, 'result', '1');
      for (const p of names.params) add(p, kinds.Constant, 'parameter', '1');
      for (const v of names.variables) add(v, kinds.Field, 'integration variable', '2');
      for (const f of FUNCTIONS) add(f, kinds.Function, 'function', '4');
      return { suggestions };
    },
  });

  monaco.languages.registerHoverProvider(LANGUAGE_ID, {
    provideHover(model, position) {
      const word = model.getWordAtPosition(position);
      if (!word) return null;
      const text = resultHovers.get(model.uri.toString())?.get(word.word);
      if (!text) return null;
      return {
        range: new monaco.Range(position.lineNumber, word.startColumn, position.lineNumber, word.endColumn),
        contents: [{ value: `**${word.word}** = \`${text.replace(/`/g, "'")}\`` }],
      };
    },
  });
}
