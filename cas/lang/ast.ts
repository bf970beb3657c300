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
  | { kind: 'param'; names: NameRef[]; domain: Domain; span: Span }
  | { kind: 'integral'; name: NameRef; integrand: Expr; vars: NameRef[]; span: Span }
  | { kind: 'expect'; name: NameRef; expr: Expr; span: Span }
  | { kind: 'note'; text: string; span: Span }
  | { kind: 'let'; name: NameRef; expr: Expr; span: Span }
  | { kind: 'rotate' | 'continue' | 'compare' | 'verify' | 'limit'; rest: string; span: Span };

export type StatementKindName = Statement['kind'];
