/**
 * Ratebook's own expression tree: the part of the mathjs syntax a study may use, and
 * nothing else. Produced by `parseExpression`, read by the checker and the compiler.
 */
export type BinaryOp = '+' | '-' | '*' | '/' | '^';
export type CompareOp = '<' | '>' | '<=' | '>=' | '==' | '!=';

export type Expr =
  | { readonly k: 'num'; readonly v: number }
  | { readonly k: 'bool'; readonly v: boolean }
  | { readonly k: 'sym'; readonly name: string }
  | { readonly k: 'bin'; readonly op: BinaryOp; readonly a: Expr; readonly b: Expr }
  | { readonly k: 'neg'; readonly a: Expr }
  | { readonly k: 'cmp'; readonly ops: readonly CompareOp[]; readonly args: readonly Expr[] }
  | { readonly k: 'logic'; readonly op: 'and' | 'or'; readonly a: Expr; readonly b: Expr }
  | { readonly k: 'not'; readonly a: Expr }
  | { readonly k: 'if'; readonly c: Expr; readonly a: Expr; readonly b: Expr }
  | { readonly k: 'call'; readonly fn: string; readonly args: readonly Expr[] };

/** Every symbol the expression reads (names, units and constants alike), in first-use order. */
export function symbolsOf(e: Expr, out: string[] = []): string[] {
  switch (e.k) {
    case 'sym': if (!out.includes(e.name)) out.push(e.name); break;
    case 'bin': case 'logic': symbolsOf(e.a, out); symbolsOf(e.b, out); break;
    case 'neg': case 'not': symbolsOf(e.a, out); break;
    case 'if': symbolsOf(e.c, out); symbolsOf(e.a, out); symbolsOf(e.b, out); break;
    case 'cmp': case 'call': for (const a of e.args) symbolsOf(a, out); break;
  }
  return out;
}
