/**
 * Complex-plane diagram data of one statement: what the computation core may attach to a
 * statement report as `diagram`, and what the worksheet screen draws. Every shape is a list
 * of points in the complex plane; the client draws only what is given (it never computes).
 * shared/ imports nothing from src/, server/ or cas/.
 */
import { z } from 'zod';

/** A point of the complex plane (the same shape as ComplexValue in evaluation.ts, kept here so the two files do not import each other). */
const complexValue = z.object({ re: z.number(), im: z.number() });

/** A contour of integration in one variable's plane, as a polyline. */
export const diagramContour = z.object({
  label: z.string(),
  /** real: the original real line; rotated: after a rotation; steepest: steepest-descent direction. */
  role: z.enum(['real', 'rotated', 'steepest']),
  points: z.array(complexValue),
});
export type DiagramContour = z.infer<typeof diagramContour>;

/** The family of contours swept by a rotation x -> e^(i theta) x, theta from `from` to `to` (radians). */
export const diagramSector = z.object({
  label: z.string(),
  from: z.number(),
  to: z.number(),
  /** Whether the integrand stays bounded on every contour of the family (the rotation is allowed). */
  allowed: z.boolean(),
});
export type DiagramSector = z.infer<typeof diagramSector>;

/** A branch cut as a polyline (the principal cut of sqrt is the negative real axis). */
export const diagramCut = z.object({ label: z.string(), points: z.array(complexValue) });
export type DiagramCut = z.infer<typeof diagramCut>;

export const CONTINUATION_EVENT_KINDS = [
  'branch-point', 'cut-crossed', 'convergence-lost', 'contour-rotated', 'sheet', 'end', 'convergence-regained',
] as const;
export type ContinuationEventKind = (typeof CONTINUATION_EVENT_KINDS)[number];

/**
 * Something met along a continuation path; `step` is the 1-based number of the step of the
 * statement's record that describes it (the card's numbering). An event without one (the end
 * point) is drawn unnumbered.
 */
export const diagramEvent = z.object({
  kind: z.enum(CONTINUATION_EVENT_KINDS),
  at: complexValue,
  text: z.string(),
  step: z.number().optional(),
});
export type DiagramEvent = z.infer<typeof diagramEvent>;

/** A continuation path in the plane of one parameter, with its events. */
export const diagramPath = z.object({
  label: z.string(),
  parameter: z.string(),
  points: z.array(complexValue),
  events: z.array(diagramEvent),
});
export type DiagramPath = z.infer<typeof diagramPath>;

/** How one eigenvalue of A (or det A itself, `of: 'det'`) moves while a parameter follows a path. */
export const diagramTrack = z.object({
  label: z.string(),
  points: z.array(complexValue),
  of: z.enum(['eigenvalue', 'det']).default('eigenvalue'),
});
export type DiagramTrack = z.infer<typeof diagramTrack>;

export const diagramData = z.object({
  contours: z.array(diagramContour).default([]),
  sectors: z.array(diagramSector).default([]),
  cuts: z.array(diagramCut).default([]),
  paths: z.array(diagramPath).default([]),
  tracks: z.array(diagramTrack).default([]),
  /** Eigenvalues of A at the statement's point, drawn as marks. */
  eigenvalues: z.array(complexValue.extend({ arg: z.number() })).default([]),
  /** The parameter point the eigenvalues belong to, in words ("k = 1"), when there are parameters. */
  eigenvaluesAt: z.string().optional(),
});
export type DiagramData = z.infer<typeof diagramData>;

/** The optional field a statement report may carry (added to StatementReport by the core). */
export interface WithDiagram {
  diagram?: DiagramData;
}
