/** A cooperative per-statement deadline: long loops call checkDeadline() and stop with a clear error. */
export class TimeLimitError extends Error {
  constructor(readonly limitMs: number) {
    super(timeLimitMessage(limitMs));
  }
}

export function timeLimitMessage(limitMs: number): string {
  const s = Number((limitMs / 1000).toPrecision(3));
  return `This statement ran longer than the time limit of ${s} s and was stopped. Simplify it or raise the limit.`;
}

/** Why a supervisor outside the core stopped a statement before it finished. */
export type StopReason =
  | { reason: 'time' }
  | { reason: 'memory'; limitMb: number }
  | { reason: 'crash'; detail: string };

/** The statement's error message, and the words later statements use to name it. */
export function stoppedMessage(stop: StopReason, timeLimitMs: number): { message: string; because: string } {
  switch (stop.reason) {
    case 'time':
      return { message: timeLimitMessage(timeLimitMs), because: 'was stopped at the time limit' };
    case 'memory':
      return {
        message: `This statement needed more memory than the evaluation limit of ${stop.limitMb} MB and was stopped. Use fewer variables or split it into smaller integrals.`,
        because: 'was stopped at the memory limit',
      };
    case 'crash':
      return {
        message: `The evaluation stopped unexpectedly while running this statement (${stop.detail}); its result is missing, the other statements were evaluated without it. Try again; if it happens again, report the statement.`,
        because: 'could not be evaluated',
      };
  }
}

let deadline = Infinity;
let limit = 5000;

export function startDeadline(limitMs: number): void { limit = limitMs; deadline = Date.now() + limitMs; }
export function clearDeadline(): void { deadline = Infinity; }
export function checkDeadline(): void { if (Date.now() > deadline) throw new TimeLimitError(limit); }
