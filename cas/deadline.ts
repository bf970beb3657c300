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

let deadline = Infinity;
let limit = 5000;

export function startDeadline(limitMs: number): void { limit = limitMs; deadline = Date.now() + limitMs; }
export function clearDeadline(): void { deadline = Infinity; }
export function checkDeadline(): void { if (Date.now() > deadline) throw new TimeLimitError(limit); }
