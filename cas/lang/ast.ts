/** Syntax trees of worksheet statements and expressions. */
import type { Domain } from '../../shared/evaluation.js';

/** 1-based line and column of a source position. */
export interface Pos { line: number; column: number; offset: number }
export interface Span { start: Pos; end: Pos }

export type BinOp = '+' | '-' | '*' | '/' | '^';

export type Expr =
  | { t: 'num'; v: string; span?: Span }
  | { t: 'const'; name: 'i' | 'pi' | 'e'; span?: Span }
  | { t: 'name'; name: string; span?: Span }
  | { t: 'neg'; a: Expr; span?: Span }
  | { t: 'bin'; op: BinOp; a: Expr; b: Expr; span?: Span }
  | { t: 'call'; fn: string; args: Expr[]; span?: Span };

export interface NameRef { name: string; span: Span }

export type Statement =
  | { kind: 'param'; names: NameRef[]; domain: Domain; /** `positive integer`: domain positive, values whole numbers. */ integer?: true; span: Span }
  | { kind: 'integral'; name: NameRef; integrand: Expr; vars: NameRef[]; kinds?: VariableKind[]; span: Span }
  | { kind: 'expect'; name: NameRef; expr: Expr; span: Span }
  | { kind: 'note'; text: string; span: Span }
  | { kind: 'let'; name: NameRef; expr: Expr; span: Span }
  | { kind: 'rotate'; target: NameRef; moves: RotateMove[]; as: NameRef; span: Span }
  | { kind: 'continue'; target: NameRef; params: NameRef[]; points: Expr[][]; at: Binding[]; span: Span }
  | { kind: 'compare'; target: NameRef; other: NameRef; span: Span }
  | { kind: 'verify'; target: NameRef; at: Binding[]; tolerance: Expr | null; span: Span }
  | { kind: 'limit'; target: NameRef; param: NameRef; to: Expr | 'inf' | '-inf'; span: Span }
  | { kind: 'moment'; name: NameRef; expr: Expr; target: NameRef; span: Span }
  | { kind: 'derivative'; name: NameRef; expr: Expr; param: NameRef; span: Span }
  | { kind: 'product'; name: NameRef; factor: Expr; index: NameRef; from: 0 | 1 | 'all'; span: Span }
  | { kind: 'determinant'; name: NameRef; potential: Expr; shape: 'interval' | 'circle'; length: Expr; conditions: 'dirichlet' | 'periodic' | 'antiperiodic'; span: Span }
  | { kind: 'sum'; name: NameRef; term: Expr; index: NameRef; span: Span }
  | { kind: 'sliced'; name: NameRef; potential: Expr; shape: 'interval' | 'circle'; length: Expr; conditions: 'dirichlet' | 'periodic' | 'antiperiodic'; slices: Expr; span: Span };

/** An integration variable's kind: real (dx), complex (d^2z = dx dy), or Grassmann (Berezin). */
export type VariableKind = 'real' | 'complex' | 'grassmann';

/** One variable of a rotation: x -> FACTOR*x (the factor read off at evaluation), or x -> steepest. */
export type RotateMove =
  | { variable: NameRef; to: 'steepest' }
  | { variable: NameRef; to: Expr };

/** NAME = EXPR inside an `at` clause. */
export interface Binding { name: NameRef; value: Expr }

export type StatementKindName = Statement['kind'];
