/**
 * The PEG grammar of one worksheet line. Statements are parsed line by line so
 * that one bad line never hides the others. Named rules ("an expression", ...)
 * give the plain words used in error sentences.
 */
export const LINE_GRAMMAR = String.raw`
{{
  function bin(head, tail) {
    return tail.reduce((a, [op, b]) => ({ t: 'bin', op, a, b, span: { start: a.span.start, end: b.span.end } }), head);
  }
}}

{
  const L = options.line ?? 1;
  const O = options.offset ?? 0;
  function pos(p) { return { line: p.line + L - 1, column: p.column, offset: p.offset + O }; }
  function span() { const l = location(); return { start: pos(l.start), end: pos(l.end) }; }
}

Line
  = _ s:Statement? _ Comment? End { return s; }

Comment "a comment"
  = "#" [^\n]*

End "the end of the line"
  = !.

Statement
  = Param / Integral / Expect / Note / Let / Rotate / Continue / Compare / Verify / Limit

Param
  = "param" __ names:NameList _ ":" _ domain:Domain
    { return { kind: 'param', names, domain, span: span() }; }

NameList
  = head:NameRef tail:(_ "," _ n:NameRef { return n; })* { return [head, ...tail]; }

Domain "a domain (positive, negative, real, complex or nonzero)"
  = d:("positive" / "negative" / "real" / "complex" / "nonzero") !IdChar { return d; }

Integral
  = "integral" __ name:NameRef _ "=" _ integrand:Expr _ vars:Measure
    { return { kind: 'integral', name, integrand, vars, span: span() }; }

Measure
  = "d" _ "(" _ vars:NameList _ ")" { return vars; }

Expect
  = "expect" __ name:NameRef _ "=" _ expr:Expr
    { return { kind: 'expect', name, expr, span: span() }; }

Let
  = "let" __ name:NameRef _ "=" _ expr:Expr
    { return { kind: 'let', name, expr, span: span() }; }

Note
  = "note" _ text:StringLit { return { kind: 'note', text, span: span() }; }

StringLit "a text in double quotes"
  = '"' chars:$[^"\n]* '"' { return chars; }

Rotate
  = "rotate" __ target:NameRef _ ":" _ moves:MoveList _ "as" __ as:NameRef
    { return { kind: 'rotate', target, moves, as, span: span() }; }

MoveList
  = head:Move tail:(_ "," _ m:Move { return m; })* { return [head, ...tail]; }

Move "a rotation such as x -> exp(i*theta)*x or x -> steepest"
  = variable:NameRef _ "->" _ "steepest" !IdChar { return { variable, to: 'steepest' }; }
  / variable:NameRef _ "->" _ to:Expr { return { variable, to }; }

Continue
  = "continue" __ target:NameRef _ ":" _ params:ParamTuple _ "along" __ points:PathPoints at:AtClause?
    { return { kind: 'continue', target, params, points, at: at ?? [], span: span() }; }

ParamTuple "a parameter, or parameters in parentheses"
  = "(" _ names:NameList _ ")" { return names; }
  / n:NameRef { return [n]; }

PathPoints
  = head:PathPoint tail:(_ "->" _ p:PathPoint { return p; })+ { return [head, ...tail]; }

PathPoint "a point of the path (an expression, or a tuple in parentheses)"
  = "(" _ head:Expr tail:(_ "," _ e:Expr { return e; })+ _ ")" { return [head, ...tail]; }
  / e:Expr { return [e]; }

AtClause
  = __ "at" __ bindings:BindingList { return bindings; }

BindingList
  = head:Binding tail:(_ "," _ b:Binding { return b; })* { return [head, ...tail]; }

Binding "a value such as k = 2"
  = name:NameRef _ "=" _ value:Expr { return { name, value }; }

Compare
  = "compare" __ target:NameRef __ "with" __ other:NameRef
    { return { kind: 'compare', target, other, span: span() }; }

Verify
  = "verify" __ target:NameRef at:AtClause? tol:ToleranceClause?
    { return { kind: 'verify', target, at: at ?? [], tolerance: tol ?? null, span: span() }; }

ToleranceClause
  = __ "with" __ "tolerance" __ t:(SciNumber / Expr) { return t; }

SciNumber "a number"
  = v:$([0-9]+ ("." [0-9]+)? [eE] "-"? [0-9]+) { return { t: 'num', v: String(Number(v)), span: span() }; }

Limit
  = "limit" __ target:NameRef _ ":" _ param:NameRef _ "->" _ to:LimitPoint
    { return { kind: 'limit', target, param, to, span: span() }; }

LimitPoint "a value, inf or -inf"
  = "-" _ "inf" !IdChar { return '-inf'; }
  / "inf" !IdChar { return 'inf'; }
  / Expr

Expr
  = Sum

Sum
  = head:Product tail:(_ op:[+-] _ b:Product { return [op, b]; })* { return bin(head, tail); }

Product
  = head:Unary tail:(_ op:[*/] _ b:Unary { return [op, b]; })* { return bin(head, tail); }

Unary
  = "-" _ a:Unary { return { t: 'neg', a, span: span() }; }
  / "+" _ a:Unary { return a; }
  / Power

// One parse of the base whether or not a power follows: trying "Atom ^ Unary" and then
// "Atom" alone would parse every nested base twice, which is exponential in the depth.
Power
  = base:Atom exp:(_ "^" _ e:Unary { return e; })? { return exp === null ? base : { t: 'bin', op: '^', a: base, b: exp, span: span() }; }

Atom
  = Number
  / Call
  / Variable
  / "(" _ e:Expr _ ")" { return e; }

Call
  = fn:Identifier _ "(" _ args:ArgList _ ")" { return { t: 'call', fn, args, span: span() }; }

ArgList
  = head:Expr tail:(_ "," _ e:Expr { return e; })* { return [head, ...tail]; }

Variable
  = name:Identifier !(_ "(") {
      // Euler's number is exp(1) in worksheets, so e is an ordinary name there; the
      // algebra adapter's answers (options.internal) may still use the constant e.
      if (name === 'i' || name === 'pi' || (name === 'e' && options.internal)) return { t: 'const', name, span: span() };
      return { t: 'name', name, span: span() };
    }

Number "a number"
  = v:$([0-9]+ ("." [0-9]+)? / "." [0-9]+) { return { t: 'num', v, span: span() }; }

NameRef
  = name:Identifier { return { name, span: span() }; }

Identifier "a name"
  = $([A-Za-z] IdChar*)

IdChar
  = [A-Za-z0-9_]

__ "a space"
  = [ \t]+

_
  = [ \t]*
`;
