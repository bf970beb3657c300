// The worksheet language (.swk) for the editor: tokens, our two themes, completion and hover.
// Every word list comes from shared/language.ts; declared names come from the report.
import type * as MonacoNs from 'monaco-editor/editor';
import type { WorksheetSymbols } from '@shared/evaluation';
import { CLAUSE_WORDS, CONSTANT_NAMES, DOMAINS, FUNCTION_NAMES, STATEMENT_KEYWORDS } from '@shared/language';
import { completionContext, completionEntries, hoverMarkdown, type CompletionKind } from './completion-source';

type Monaco = typeof MonacoNs;

export const LANGUAGE_ID = 'sheetwise';
export const LIGHT_THEME = 'sheetwise-light';
export const DARK_THEME = 'sheetwise-dark';

/** What the editor knows of one model beyond its text: the report's results and declared names. */
export interface EditorFacts {
  results: ReadonlyMap<string, string>;
  symbols: WorksheetSymbols | null;
}

/** Facts per model URI, set by the editor component from the latest report. */
export const editorFacts = new Map<string, EditorFacts>();

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
    // Monaco's word boundaries (double-click, completion range), not a reading of the language.
    wordPattern: /[A-Za-z_]\w*|\d+(\.\d+)?/,
  });
  // Monarch tokenizes by regular expressions by design: this is the only place a pattern
  // touches worksheet source, and only to colour it. The word lists are the language's own.
  monaco.languages.setMonarchTokensProvider(LANGUAGE_ID, {
    defaultToken: '',
    keywords: [...STATEMENT_KEYWORDS, ...CLAUSE_WORDS],
    domains: [...DOMAINS],
    functions: [...FUNCTION_NAMES],
    constants: [...CONSTANT_NAMES],
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
      // Widgets (completion list, hovers, find) in the page's own colours, not the editor's stock blue.
      focusBorder: '#0b4f63',
      'editorWidget.background': '#fffdf9',
      'editorWidget.foreground': '#0d2a36',
      'editorWidget.border': '#d8d2c4',
      'editorSuggestWidget.background': '#fffdf9',
      'editorSuggestWidget.foreground': '#0d2a36',
      'editorSuggestWidget.border': '#d8d2c4',
      'editorSuggestWidget.selectedBackground': '#e6eef0',
      'editorSuggestWidget.selectedForeground': '#0d2a36',
      'editorSuggestWidget.selectedIconForeground': '#0b4f63',
      'editorSuggestWidget.highlightForeground': '#b5651d',
      'editorSuggestWidget.focusHighlightForeground': '#8a4a12',
      'list.activeSelectionBackground': '#e6eef0',
      'list.activeSelectionForeground': '#0d2a36',
      'list.focusBackground': '#e6eef0',
      'list.focusForeground': '#0d2a36',
      'list.focusOutline': '#0b4f63',
      'list.hoverBackground': '#f3efe6',
      'list.highlightForeground': '#b5651d',
      'editorHoverWidget.background': '#fffdf9',
      'editorHoverWidget.border': '#d8d2c4',
      'textLink.foreground': '#0b4f63',
      'textLink.activeForeground': '#0b4f63',
      'editorBracketMatch.border': '#b5651d',
      'editor.wordHighlightBackground': '#f0e6d6',
      'editor.findMatchHighlightBackground': '#f6e6d6',
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
      focusBorder: '#97cee6',
      'editorWidget.background': '#152a33',
      'editorWidget.foreground': '#e9e4d8',
      'editorWidget.border': '#2d4650',
      'editorSuggestWidget.background': '#152a33',
      'editorSuggestWidget.foreground': '#e9e4d8',
      'editorSuggestWidget.border': '#2d4650',
      'editorSuggestWidget.selectedBackground': '#1f3c48',
      'editorSuggestWidget.selectedForeground': '#e9e4d8',
      'editorSuggestWidget.selectedIconForeground': '#97cee6',
      'editorSuggestWidget.highlightForeground': '#e8a868',
      'editorSuggestWidget.focusHighlightForeground': '#f0c08a',
      'list.activeSelectionBackground': '#1f3c48',
      'list.activeSelectionForeground': '#e9e4d8',
      'list.focusBackground': '#1f3c48',
      'list.focusForeground': '#e9e4d8',
      'list.focusOutline': '#97cee6',
      'list.hoverBackground': '#1a313b',
      'list.highlightForeground': '#e8a868',
      'editorHoverWidget.background': '#152a33',
      'editorHoverWidget.border': '#2d4650',
      'textLink.foreground': '#97cee6',
      'textLink.activeForeground': '#97cee6',
      'editorBracketMatch.border': '#e8a868',
    },
  });

  const kinds = monaco.languages.CompletionItemKind;
  const KIND: Record<CompletionKind, MonacoNs.languages.CompletionItemKind> = {
    keyword: kinds.Keyword,
    clause: kinds.Keyword,
    domain: kinds.EnumMember,
    function: kinds.Function,
    constant: kinds.Constant,
    result: kinds.Variable,
    parameter: kinds.Constant,
    variable: kinds.Field,
  };
  monaco.languages.registerCompletionItemProvider(LANGUAGE_ID, {
    provideCompletionItems(model, position) {
      const word = model.getWordUntilPosition(position);
      const range = {
        startLineNumber: position.lineNumber,
        endLineNumber: position.lineNumber,
        startColumn: word.startColumn,
        endColumn: word.endColumn,
      };
      const before = model.getLineContent(position.lineNumber).slice(0, word.startColumn - 1);
      const symbols = editorFacts.get(model.uri.toString())?.symbols ?? null;
      const suggestions = completionEntries(completionContext(before), symbols).map((e) => ({
        label: e.label,
        kind: KIND[e.kind],
        detail: e.detail,
        insertText: e.label,
        range,
        sortText: e.sort,
      }));
      return { suggestions };
    },
  });

  monaco.languages.registerHoverProvider(LANGUAGE_ID, {
    provideHover(model, position) {
      const word = model.getWordAtPosition(position);
      if (!word) return null;
      const facts = editorFacts.get(model.uri.toString());
      const text = hoverMarkdown(word.word, facts?.results ?? new Map(), facts?.symbols ?? null);
      if (!text) return null;
      return {
        range: new monaco.Range(position.lineNumber, word.startColumn, position.lineNumber, word.endColumn),
        contents: [{ value: text }],
      };
    },
  });
}
