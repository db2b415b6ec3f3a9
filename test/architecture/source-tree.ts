/** The TypeScript sources of src/, read with the compiler's own parser, for the architecture checks. */
import { readdirSync, readFileSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import ts from 'typescript';

export const SRC = resolve(import.meta.dirname, '../../src');

export function sourceFiles(dir = SRC): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => {
    const p = join(dir, e.name);
    if (e.isDirectory()) return sourceFiles(p);
    return e.name.endsWith('.ts') ? [p] : [];
  });
}

export function parse(file: string): ts.SourceFile {
  return ts.createSourceFile(file, readFileSync(file, 'utf8'), ts.ScriptTarget.ES2022, true);
}

export interface FunctionSpan {
  file: string;
  name: string;
  line: number;
  lines: number;
}

/** Every function, method, arrow function and function expression with its length in lines. */
export function functionSpans(file: string): FunctionSpan[] {
  const sf = parse(file);
  const spans: FunctionSpan[] = [];
  const visit = (node: ts.Node) => {
    if (ts.isFunctionLike(node) && 'body' in node && node.body) {
      const start = sf.getLineAndCharacterOfPosition(node.getStart(sf)).line;
      const end = sf.getLineAndCharacterOfPosition(node.getEnd()).line;
      const named = (node as { name?: ts.Node }).name;
      const owner = ts.isVariableDeclaration(node.parent) ? node.parent.name.getText(sf) : undefined;
      spans.push({ file: relative(SRC, file), name: named?.getText(sf) ?? owner ?? '(anonymous)', line: start + 1, lines: end - start + 1 });
    }
    ts.forEachChild(node, visit);
  };
  visit(sf);
  return spans;
}

/** Relative imports of a file (static and dynamic, type-only included), resolved to .ts paths. */
export function relativeImports(file: string, includeTypeOnly: boolean): string[] {
  const sf = parse(file);
  const out: string[] = [];
  const add = (spec: string) => {
    if (spec.startsWith('.')) out.push(resolve(dirname(file), spec.replace(/\.js$/, '.ts')));
  };
  const visit = (node: ts.Node) => {
    if ((ts.isImportDeclaration(node) || ts.isExportDeclaration(node)) && node.moduleSpecifier && ts.isStringLiteral(node.moduleSpecifier)) {
      const typeOnly = ts.isImportDeclaration(node) ? node.importClause?.isTypeOnly === true : node.isTypeOnly;
      if (includeTypeOnly || !typeOnly) add(node.moduleSpecifier.text);
    }
    if (ts.isCallExpression(node) && node.expression.kind === ts.SyntaxKind.ImportKeyword && ts.isStringLiteral(node.arguments[0]!)) {
      add((node.arguments[0] as ts.StringLiteral).text);
    }
    ts.forEachChild(node, visit);
  };
  visit(sf);
  return out;
}
