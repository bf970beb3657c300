/**
 * The one renderer of the step record: a typed step becomes a sentence (command line,
 * screen reader text), LaTeX (export, card formula) and the card's parts. Nothing
 * else in the product composes or parses step sentences.
 *
 * Example: renderStep(step).text is the sentence the command line prints for it.
 */
import type { Step } from '../evaluation.js';

export interface RenderedStep {
  /** The sentence in plain words, formulas in infix text. */
  text: string;
  /** The step's formula in LaTeX (math mode, without delimiters). */
  latex: string;
}

export function renderStep(step: Step): RenderedStep {
  return { text: step.text, latex: step.latex };
}
