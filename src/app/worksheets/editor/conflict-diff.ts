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
  viewChild,
} from '@angular/core';
import type * as MonacoNs from 'monaco-editor/editor';
import { ThemeStore } from '../../core/theme/theme-store';
import { loadMonaco } from './monaco-loader';
import type { Monaco } from './monaco-setup';
import { DARK_THEME, LANGUAGE_ID, LIGHT_THEME } from './sheetwise-language';

/**
 * Their saved version (left, read-only) beside the user's text (right, editable, to merge by
 * hand). Edits on the right flow out through `mineChange`.
 */
@Component({
  selector: 'app-conflict-diff',
  template: `<div class="diff" #host data-testid="conflict-diff" [attr.data-ready]="ready() ? 'true' : null"></div>`,
  styles: `
    :host { display: block; }
    .diff {
      height: var(--sw-diff-height, 360px);
      border: 1px solid var(--sw-rule);
      border-radius: 8px;
      overflow: hidden;
      background: var(--sw-surface);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ConflictDiff {
  private readonly theme = inject(ThemeStore);
  private readonly hostRef = viewChild.required<ElementRef<HTMLElement>>('host');

  readonly theirs = input.required<string>();
  readonly mine = input.required<string>();
  readonly mineChange = output<string>();

  protected readonly ready = signal(false);
  private monaco: Monaco | null = null;
  private diff: MonacoNs.editor.IStandaloneDiffEditor | null = null;
  private models: MonacoNs.editor.ITextModel[] = [];

  constructor() {
    let destroyed = false;
    inject(DestroyRef).onDestroy(() => {
      destroyed = true;
      this.diff?.dispose();
      for (const m of this.models) m.dispose();
    });
    void loadMonaco().then((monaco) => {
      if (!destroyed) this.create(monaco);
    });
    effect(() => {
      const theirs = this.theirs();
      if (this.ready() && this.models[0].getValue() !== theirs) this.models[0].setValue(theirs);
    });
    effect(() => {
      const dark = this.theme.dark();
      if (this.ready()) this.monaco!.editor.setTheme(dark ? DARK_THEME : LIGHT_THEME);
    });
  }

  private create(monaco: Monaco): void {
    this.monaco = monaco;
    const original = monaco.editor.createModel(this.theirs(), LANGUAGE_ID);
    const modified = monaco.editor.createModel(this.mine(), LANGUAGE_ID);
    this.models = [original, modified];
    this.diff = monaco.editor.createDiffEditor(this.hostRef().nativeElement, {
      theme: this.theme.dark() ? DARK_THEME : LIGHT_THEME,
      automaticLayout: true,
      renderSideBySide: true,
      originalEditable: false,
      readOnly: false,
      minimap: { enabled: false },
      fontFamily: "'IBM Plex Mono', ui-monospace, monospace",
      fontSize: 13,
      scrollBeyondLastLine: false,
      ariaLabel: 'Their version on the left, yours on the right',
    });
    this.diff.setModel({ original, modified });
    modified.onDidChangeContent(() => this.mineChange.emit(modified.getValue()));
    this.ready.set(true);
  }
}
