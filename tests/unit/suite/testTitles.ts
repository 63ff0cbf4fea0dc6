import fs from 'node:fs';
import path from 'node:path';
import ts from 'typescript';

/** One test's full title: its describe blocks and its own title, joined by " > " (as vitest reports it). */
export interface TestTitle {
  file: string;
  line: number;
  title: string;
}

const SUITE = new Set(['describe', 'suite']);
const TEST = new Set(['it', 'test']);

/** `it`, `it.each(…)`, `it.skip`, `describe.each(…)` … → the base name ("it", "describe"), else null. */
function baseName(callee: ts.Expression): string | null {
  if (ts.isIdentifier(callee)) return callee.text;
  if (ts.isPropertyAccessExpression(callee)) return baseName(callee.expression);
  if (ts.isCallExpression(callee)) return baseName(callee.expression);
  return null;
}

/** A title argument as written: string literals by value, templates by their source text (their rows share it). */
function titleText(arg: ts.Expression | undefined, source: ts.SourceFile): string | null {
  if (!arg) return null;
  if (ts.isStringLiteral(arg) || ts.isNoSubstitutionTemplateLiteral(arg)) return arg.text;
  return arg.getText(source);
}

/**
 * Every describe/it title in one test file, with the describe blocks around it.
 * @param file - path of a test file
 * @returns the full titles of its tests, each with its line
 */
export function testTitles(file: string): TestTitle[] {
  const source = ts.createSourceFile(file, fs.readFileSync(file, 'utf8'), ts.ScriptTarget.Latest, true);
  const out: TestTitle[] = [];
  const visit = (node: ts.Node, stack: string[]): void => {
    if (ts.isCallExpression(node)) {
      const name = baseName(node.expression);
      const title = name && (SUITE.has(name) || TEST.has(name)) ? titleText(node.arguments[0], source) : null;
      if (name && title !== null && SUITE.has(name)) {
        for (const arg of node.arguments.slice(1)) visit(arg, [...stack, title]);
        return;
      }
      if (name && title !== null && TEST.has(name)) {
        const line = source.getLineAndCharacterOfPosition(node.getStart(source)).line + 1;
        out.push({ file, line, title: [...stack, title].join(' > ') });
        return;
      }
    }
    ts.forEachChild(node, (child) => visit(child, stack));
  };
  visit(source, []);
  return out;
}

/**
 * Every test file under a folder.
 * @param dir - folder to search
 * @returns paths of the *.test.ts files, sorted
 */
export function testFiles(dir: string): string[] {
  return (fs.readdirSync(dir, { recursive: true }) as string[])
    .filter((f) => f.endsWith('.test.ts') && !f.split(path.sep).includes('node_modules'))
    .map((f) => path.join(dir, f))
    .sort();
}

/**
 * Full titles that more than one test carries across the files.
 * @param titles - titles of all tests
 * @returns each repeated title with where it occurs
 */
export function duplicateTitles(titles: TestTitle[]): Map<string, TestTitle[]> {
  const byTitle = new Map<string, TestTitle[]>();
  for (const t of titles) byTitle.set(t.title, [...(byTitle.get(t.title) ?? []), t]);
  return new Map([...byTitle].filter(([, list]) => list.length > 1));
}
