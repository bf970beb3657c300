import { Directive, ElementRef, effect, inject, input } from '@angular/core';

type Katex = typeof import('katex').default;
let katexLoading: Promise<Katex> | null = null;

/** KaTeX, loaded on first use (it is too large for the initial bundle). */
export function loadKatex(): Promise<Katex> {
  katexLoading ??= (() => {
    if (typeof document !== 'undefined' && !document.querySelector('link[data-katex-css]')) {
      const link = document.createElement('link');
      link.rel = 'stylesheet';
      link.href = 'katex.css';
      link.dataset['katexCss'] = '';
      document.head.appendChild(link);
    }
    return import('katex').then((m) => m.default);
  })();
  return katexLoading;
}

/**
 * Renders LaTeX into its element with katex.render (Angular's sanitizer would strip KaTeX's
 * markup if it went through a binding). Until KaTeX is there, and if it cannot parse the
 * formula, the LaTeX source shows as text.
 */
@Directive({
  selector: '[appMath]',
  host: { '[attr.data-latex]': 'appMath()' },
})
export class MathDirective {
  private readonly el = inject<ElementRef<HTMLElement>>(ElementRef);
  readonly appMath = input.required<string>();
  readonly display = input(false);

  constructor() {
    effect(() => {
      const tex = this.appMath();
      const display = this.display();
      const el = this.el.nativeElement;
      if (!el.firstChild) el.textContent = tex;
      void loadKatex().then(
        (katex) => {
          if (this.appMath() !== tex) return;
          try {
            katex.render(tex, el, { displayMode: display, throwOnError: false, output: 'htmlAndMathml', strict: false });
            el.dataset['rendered'] = 'true';
          } catch {
            el.textContent = tex;
          }
        },
        () => (el.textContent = tex),
      );
    });
  }
}
