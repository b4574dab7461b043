/**
 * Finds module-level mutable state in a TypeScript source: a top-level `let`/`var`, or a write to a
 * module-level binding (assignment, ++/--, a mutating method, Object.assign onto it) — directly or
 * through a local that is just another name for it. `memo` names caches whose `.set` is allowed.
 * A parser-based guard, not a proof: a write through a value fetched out of a module-level
 * container (e.g. `cache.get(k).x = 1`) is not followed.
 */
import ts from 'typescript';

const MUTATING_METHODS = new Set([
  'set',
  'add',
  'delete',
  'clear',
  'push',
  'pop',
  'shift',
  'unshift',
  'splice',
  'fill',
  'sort',
  'reverse',
  'copyWithin',
]);
const ASSIGNMENTS = new Set([
  ts.SyntaxKind.EqualsToken,
  ts.SyntaxKind.PlusEqualsToken,
  ts.SyntaxKind.MinusEqualsToken,
  ts.SyntaxKind.AsteriskEqualsToken,
  ts.SyntaxKind.SlashEqualsToken,
  ts.SyntaxKind.PercentEqualsToken,
  ts.SyntaxKind.BarEqualsToken,
  ts.SyntaxKind.AmpersandEqualsToken,
  ts.SyntaxKind.QuestionQuestionEqualsToken,
  ts.SyntaxKind.BarBarEqualsToken,
  ts.SyntaxKind.AmpersandAmpersandEqualsToken,
]);

/** The module-level binding an access chain like `A.b[c].d` starts from, if any. */
function rootName(e: ts.Expression): string | undefined {
  let x = e;
  while (ts.isPropertyAccessExpression(x) || ts.isElementAccessExpression(x) || ts.isNonNullExpression(x))
    x = x.expression;
  return ts.isIdentifier(x) && x !== e ? x.text : undefined;
}

/** Every breach of the rule in one source file, as "file:line: what". */
export function moduleStateProblems(fileName: string, source: string, memo: string[] = []): string[] {
  const sf = ts.createSourceFile(fileName, source, ts.ScriptTarget.Latest, true);
  const problems: string[] = [];
  const at = (n: ts.Node, what: string) =>
    problems.push(`${fileName}:${sf.getLineAndCharacterOfPosition(n.getStart()).line + 1}: ${what}`);
  const names = new Set<string>();
  for (const st of sf.statements) {
    if (!ts.isVariableStatement(st)) continue;
    const flags = st.declarationList.flags;
    if (flags & (ts.NodeFlags.Let | ts.NodeFlags.Const) && !(flags & ts.NodeFlags.Const))
      at(st, 'module-level `let`');
    else if (!(flags & (ts.NodeFlags.Let | ts.NodeFlags.Const))) at(st, 'module-level `var`');
    for (const d of st.declarationList.declarations) if (ts.isIdentifier(d.name)) names.add(d.name.text);
  }
  // A local that is simply another name for a module-level binding (`const out = SCRATCH`) counts as it.
  const collect = (n: ts.Node) => {
    if (
      ts.isVariableDeclaration(n) &&
      ts.isIdentifier(n.name) &&
      n.initializer &&
      ts.isIdentifier(n.initializer) &&
      names.has(n.initializer.text) &&
      !memo.includes(n.initializer.text)
    )
      names.add(n.name.text);
    ts.forEachChild(n, collect);
  };
  collect(sf);
  const visit = (n: ts.Node) => {
    if (ts.isBinaryExpression(n) && ASSIGNMENTS.has(n.operatorToken.kind)) {
      const r = rootName(n.left);
      if (r && names.has(r)) at(n, `writes module-level \`${r}\``);
    }
    if (
      (ts.isPrefixUnaryExpression(n) || ts.isPostfixUnaryExpression(n)) &&
      (n.operator === ts.SyntaxKind.PlusPlusToken || n.operator === ts.SyntaxKind.MinusMinusToken)
    ) {
      const r = rootName(n.operand);
      if (r && names.has(r)) at(n, `writes module-level \`${r}\``);
    }
    if (ts.isCallExpression(n) && ts.isPropertyAccessExpression(n.expression)) {
      const method = n.expression.name.text;
      const target = n.expression.expression;
      const r = ts.isIdentifier(target) ? target.text : rootName(target);
      if (r && names.has(r) && MUTATING_METHODS.has(method) && !(memo.includes(r) && ts.isIdentifier(target)))
        at(n, `mutates module-level \`${r}\` (.${method})`);
      if (method === 'assign' && ts.isIdentifier(target) && target.text === 'Object' && n.arguments[0]) {
        const a0 = n.arguments[0];
        const r0 = ts.isIdentifier(a0) ? a0.text : rootName(a0);
        if (r0 && names.has(r0)) at(n, `Object.assign onto module-level \`${r0}\``);
      }
    }
    ts.forEachChild(n, visit);
  };
  visit(sf);
  for (const m of memo)
    if (!names.has(m)) problems.push(`${fileName}: memo cache \`${m}\` is listed but not declared`);
  return problems;
}
