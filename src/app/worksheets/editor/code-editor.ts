import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  ElementRef,
  effect,
  inject,
  input,
  output,
  signal,
  untracked,
  viewChild,
} from '@angular/core';
import type * as MonacoNs from 'monaco-editor/editor';
import { ThemeStore } from '../../core/theme/theme-store';
import { loadMonaco } from './monaco-loader';
import type { Monaco } from './monaco-setup';
import type { WorksheetSymbols } from '@shared/evaluation';
import { DARK_THEME, LANGUAGE_ID, LIGHT_THEME, editorFacts } from './sheetwise-language';

/** A problem to show in the editor at its line and column. */
export interface EditorProblem {
  line: number;
  column: number;
  message: string;
  severity: 'error' | 'warning';
}

/** What the host element offers end-to-end tests: the text and markers, read from the editor model. */
export interface EditorTestHooks {
  sheetwiseText(): string;
  sheetwiseMarkers(): { line: number; column: number; message: string }[];
}

let modelCounter = 0;

/**
 * The worksheet source in Monaco with our language. `value` flows in; edits flow out through
 * `valueChange`. The page's shortcuts arrive as `save`, `evaluateNow`, `nextProblem` and `help`.
 */
@Component({
  selector: 'app-code-editor',
  template: `
    <div class="host" #host data-testid="editor" [attr.data-ready]="ready() ? 'true' : null" [attr.aria-busy]="!ready()">
      @if (!ready()) {
        <pre class="fallback" aria-label="Worksheet source, loading the editor">{{ value() }}</pre>
      }
    </div>
  `,
  styles: `
    :host { display: block; }
    .host {
      position: relative;
      height: var(--sw-editor-height, 520px);
      border: 1px solid var(--sw-rule);
      border-radius: 8px;
      overflow: hidden;
      background: var(--sw-surface);
    }
    .fallback {
      margin: 0;
      padding: 0.6rem 1rem;
      font-family: var(--sw-font-mono);
      font-size: 14px;
      line-height: 21px;
      white-space: pre;
      color: var(--sw-ink);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CodeEditor {
  private readonly theme = inject(ThemeStore);
  private readonly hostRef = viewChild.required<ElementRef<HTMLElement>>('host');

  readonly value = input('');
  readonly readOnly = input(false);
  readonly problems = input<EditorProblem[]>([]);
  /** One-line results by name, shown on hover. */
  readonly hovers = input<Map<string, string>>(new Map());
  /** The names the latest report declares, offered in completions and explained on hover. */
  readonly symbols = input<WorksheetSymbols | null>(null);
  readonly ariaLabel = input('Worksheet source');

  readonly valueChange = output<string>();
  readonly cursorLine = output<number>();
  readonly save = output<void>();
  readonly evaluateNow = output<void>();
  readonly nextProblem = output<void>();
  readonly help = output<void>();

  protected readonly ready = signal(false);
  private monaco: Monaco | null = null;
  private editor: MonacoNs.editor.IStandaloneCodeEditor | null = null;
  private model: MonacoNs.editor.ITextModel | null = null;
  private settingValue = false;

  constructor() {
    const destroyRef = inject(DestroyRef);
    let destroyed = false;
    destroyRef.onDestroy(() => {
      destroyed = true;
      if (this.model) editorFacts.delete(this.model.uri.toString());
      this.editor?.dispose();
      this.model?.dispose();
    });
    void loadMonaco().then((monaco) => {
      if (destroyed) return;
      this.create(monaco);
    });

    effect(() => {
      const value = this.value();
      const model = this.model;
      if (this.ready() && model && model.getValue() !== value) {
        this.settingValue = true;
        // An edit operation, so that undo still works after a value comes in from outside.
        this.editor!.executeEdits('sheetwise', [{ range: model.getFullModelRange(), text: value }]);
        this.editor!.pushUndoStop();
        this.settingValue = false;
      }
    });
    effect(() => {
      const readOnly = this.readOnly();
      if (this.ready()) this.editor!.updateOptions({ readOnly });
    });
    effect(() => {
      const problems = this.problems();
      if (this.ready()) untracked(() => this.applyProblems(problems));
    });
    effect(() => {
      const facts = { results: this.hovers(), symbols: this.symbols() };
      if (this.ready() && this.model) editorFacts.set(this.model.uri.toString(), facts);
    });
    effect(() => {
      const dark = this.theme.dark();
      if (this.ready()) this.monaco!.editor.setTheme(dark ? DARK_THEME : LIGHT_THEME);
    });
  }

  /** Put the cursor on a line and bring it into view. */
  revealLine(line: number, column = 1, focus = true): void {
    if (!this.editor) return;
    this.editor.setPosition({ lineNumber: line, column });
    this.editor.revealLineInCenterIfOutsideViewport(line);
    if (focus) this.editor.focus();
  }

  focus(): void {
    this.editor?.focus();
  }

  /** Insert a line of text after a line (an edit, so Undo takes it back); answers the new line's number. */
  insertLineAfter(line: number, text: string): number {
    const editor = this.editor;
    const model = this.model;
    if (!editor || !model) return line + 1;
    const after = Math.min(Math.max(line, 1), model.getLineCount());
    const end = model.getLineMaxColumn(after);
    editor.executeEdits('sheetwise', [{ range: { startLineNumber: after, startColumn: end, endLineNumber: after, endColumn: end }, text: `\n${text}` }]);
    editor.pushUndoStop();
    return after + 1;
  }

  /** The current cursor line (1 when the editor is not there yet). */
  currentLine(): number {
    return this.editor?.getPosition()?.lineNumber ?? 1;
  }

  private create(monaco: Monaco): void {
    this.monaco = monaco;
    const host = this.hostRef().nativeElement;
    const uri = monaco.Uri.parse(`inmemory://sheetwise/worksheet-${++modelCounter}.swk`);
    this.model = monaco.editor.createModel(this.value(), LANGUAGE_ID, uri);
    this.editor = monaco.editor.create(host, {
      model: this.model,
      theme: this.theme.dark() ? DARK_THEME : LIGHT_THEME,
      readOnly: this.readOnly(),
      automaticLayout: true,
      minimap: { enabled: false },
      fontFamily: "'IBM Plex Mono', ui-monospace, monospace",
      fontSize: 14,
      lineHeight: 21,
      scrollBeyondLastLine: false,
      renderLineHighlight: 'line',
      wordWrap: 'on',
      tabSize: 2,
      padding: { top: 8, bottom: 8 },
      ariaLabel: this.ariaLabel(),
      accessibilitySupport: 'auto',
      fixedOverflowWidgets: true,
      quickSuggestions: { other: true, comments: false, strings: false },
      // Enter always ends the line; Tab accepts a completion.
      acceptSuggestionOnEnter: 'off',
    });
    const { KeyMod, KeyCode } = monaco;
    this.editor.addAction({
      id: 'sheetwise.save',
      label: 'Save the worksheet',
      keybindings: [KeyMod.CtrlCmd | KeyCode.KeyS],
      run: () => this.save.emit(),
    });
    this.editor.addAction({
      id: 'sheetwise.evaluate',
      label: 'Evaluate now',
      keybindings: [KeyMod.CtrlCmd | KeyCode.Enter],
      run: () => this.evaluateNow.emit(),
    });
    this.editor.addAction({
      id: 'sheetwise.nextProblem',
      label: 'Go to the next problem',
      keybindings: [KeyCode.F8],
      run: () => this.nextProblem.emit(),
    });
    this.editor.addAction({
      id: 'sheetwise.help',
      label: 'Keyboard shortcuts',
      keybindings: [KeyCode.F1],
      run: () => this.help.emit(),
    });
    this.keepTabEscape(host);
    this.model.onDidChangeContent(() => {
      if (!this.settingValue) this.valueChange.emit(this.model!.getValue());
    });
    this.editor.onDidChangeCursorPosition((e) => this.cursorLine.emit(e.position.lineNumber));
    const hooks: EditorTestHooks = {
      sheetwiseText: () => this.model?.getValue() ?? '',
      sheetwiseMarkers: () =>
        monaco.editor
          .getModelMarkers({ resource: this.model!.uri })
          .map((m) => ({ line: m.startLineNumber, column: m.startColumn, message: m.message })),
    };
    Object.assign(host, hooks);
    editorFacts.set(uri.toString(), { results: this.hovers(), symbols: this.symbols() });
    this.ready.set(true);
  }

  /**
   * Esc then Tab (or Shift+Tab) leaves the editor for the next (or previous) control of the page;
   * Tab alone indents or accepts a completion as usual. Listening in the capture phase on the
   * host sees the keys before the editor does.
   */
  private keepTabEscape(host: HTMLElement): void {
    let armed = false;
    host.addEventListener(
      'keydown',
      (e: KeyboardEvent) => {
        if (e.key === 'Escape') {
          armed = true;
          return;
        }
        if (e.key === 'Tab' && armed && !e.ctrlKey && !e.altKey && !e.metaKey) {
          e.preventDefault();
          e.stopPropagation();
          armed = false;
          focusBeyond(host, e.shiftKey ? -1 : 1);
          return;
        }
        if (!['Shift', 'Control', 'Alt', 'Meta'].includes(e.key)) armed = false;
      },
      true,
    );
  }

  private applyProblems(problems: EditorProblem[]): void {
    const monaco = this.monaco!;
    const model = this.model!;
    const lines = model.getLineCount();
    const markers = problems
      .filter((p) => p.line >= 1 && p.line <= lines)
      .map((p) => {
        const text = model.getLineContent(p.line);
        const column = Math.min(Math.max(1, p.column), text.length + 1);
        const word = model.getWordAtPosition({ lineNumber: p.line, column });
        const endColumn = word && word.endColumn > column ? word.endColumn : Math.max(text.length + 1, column + 1);
        return {
          startLineNumber: p.line,
          startColumn: column,
          endLineNumber: p.line,
          endColumn,
          message: p.message,
          severity: p.severity === 'error' ? monaco.MarkerSeverity.Error : monaco.MarkerSeverity.Warning,
          source: 'Sheetwise',
        };
      });
    monaco.editor.setModelMarkers(model, 'sheetwise', markers);
  }
}

const FOCUSABLE = 'a[href], button:not([disabled]), input:not([disabled]), select:not([disabled]), textarea:not([disabled]), summary, [tabindex]:not([tabindex="-1"])';

/** Move the focus to the first focusable element after (dir 1) or before (dir -1) an element, outside it. */
export function focusBeyond(el: HTMLElement, dir: 1 | -1): void {
  const all = [...document.querySelectorAll<HTMLElement>(FOCUSABLE)].filter(
    (x) => !el.contains(x) && x.getClientRects().length > 0 && !x.closest('[inert], dialog:not([open])') && x.tabIndex >= 0,
  );
  const after = all.filter((x) => (el.compareDocumentPosition(x) & Node.DOCUMENT_POSITION_FOLLOWING) !== 0);
  const before = all.filter((x) => (el.compareDocumentPosition(x) & Node.DOCUMENT_POSITION_PRECEDING) !== 0);
  const target = dir === 1 ? after[0] : before[before.length - 1];
  (target ?? (el.ownerDocument.activeElement as HTMLElement | null))?.focus();
}
