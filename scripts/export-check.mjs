#!/usr/bin/env node
// Lists the exports of the production sources (server/ and client/) that no other production source
// imports. The ones that matter: code that runs only outside production (imported by tests, the bench
// or scripts, and not used by its own module either): a production export for a test only (move it
// into test/, or test the thing production uses). `--all` also lists exports a module uses itself that
// tests import to check on their own, and exports nobody imports. The entry modules' exports are their
// public face and are not listed. Exits 1 when there is code that runs only outside production.
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import ts from 'typescript';

const root = join(fileURLToPath(new URL('.', import.meta.url)), '..');

/** Modules whose exports are the package's or a bundle's public face (scripts/build.mjs, package.json). */
const ENTRIES = ['server/src/api/engine.ts', 'server/src/cli/main.ts', 'server/src/cli/plotRender.ts', 'server/src/lsp/main.ts', 'server/src/lsp/worker.ts', 'server/src/lsp/sweepWorker.ts', 'client/src/extension.ts', 'client/webview/main.ts'];

function* sources(dir) {
  if (!existsSync(dir)) return;
  for (const entry of readdirSync(dir)) {
    const p = join(dir, entry);
    if (statSync(p).isDirectory()) {
      if (entry !== 'node_modules' && entry !== 'fixtures') yield* sources(p);
    } else if (/\.(ts|mts|mjs|js)$/.test(entry) && !entry.endsWith('.d.ts')) yield p;
  }
}

function resolveSpec(from, spec) {
  if (!spec.startsWith('.')) return null;
  const base = resolve(dirname(from), spec.replace(/\.(js|mjs)$/, ''));
  for (const c of [base, `${base}.ts`, `${base}.mts`, join(base, 'index.ts'), `${base}.mjs`]) if (existsSync(c) && statSync(c).isFile()) return c;
  return null;
}

/** The names a file exports (declarations and `export { a, b }` without a `from`). */
function exportsOf(sf) {
  const out = [];
  const isExported = (n) => ts.getModifiers?.(n)?.some((m) => m.kind === ts.SyntaxKind.ExportKeyword) ?? false;
  for (const st of sf.statements) {
    if (ts.isExportDeclaration(st) && !st.moduleSpecifier && st.exportClause && ts.isNamedExports(st.exportClause)) {
      for (const e of st.exportClause.elements) out.push(e.name.text);
    } else if (isExported(st)) {
      if (ts.isVariableStatement(st)) for (const d of st.declarationList.declarations) ts.isIdentifier(d.name) && out.push(d.name.text);
      else if (st.name && ts.isIdentifier(st.name)) out.push(st.name.text);
    }
  }
  return out;
}

/** Records in `used` every (module, name) a file imports; a namespace import or `export *` uses every name ('*'). */
function importsOf(file, sf, used) {
  const use = (spec, name) => {
    const target = resolveSpec(file, spec);
    if (!target) return;
    if (!used.has(target)) used.set(target, new Set());
    used.get(target).add(name);
  };
  const visit = (n) => {
    if ((ts.isImportDeclaration(n) || ts.isExportDeclaration(n)) && n.moduleSpecifier && ts.isStringLiteral(n.moduleSpecifier)) {
      const spec = n.moduleSpecifier.text;
      if (ts.isImportDeclaration(n)) {
        const c = n.importClause;
        if (!c) use(spec, '*');
        else {
          if (c.name) use(spec, 'default');
          if (c.namedBindings && ts.isNamespaceImport(c.namedBindings)) use(spec, '*');
          if (c.namedBindings && ts.isNamedImports(c.namedBindings)) for (const e of c.namedBindings.elements) use(spec, (e.propertyName ?? e.name).text);
        }
      } else if (!n.exportClause || !ts.isNamedExports(n.exportClause)) use(spec, '*');
      else for (const e of n.exportClause.elements) use(spec, (e.propertyName ?? e.name).text);
    } else if (ts.isImportTypeNode(n) && ts.isLiteralTypeNode(n.argument) && ts.isStringLiteral(n.argument.literal)) {
      const q = n.qualifier;
      use(n.argument.literal.text, q ? (ts.isIdentifier(q) ? q.text : q.left.getText(sf)) : '*');
    } else if (ts.isCallExpression(n) && n.expression.kind === ts.SyntaxKind.ImportKeyword && n.arguments[0] && ts.isStringLiteral(n.arguments[0])) {
      use(n.arguments[0].text, '*');
    }
    ts.forEachChild(n, visit);
  };
  visit(sf);
}

function parse(file) {
  return ts.createSourceFile(file, readFileSync(file, 'utf8'), ts.ScriptTarget.Latest, true);
}

/**
 * "FILE: name" lines of the production exports no other production source imports: `testOnly`, code
 * that runs only in tests (imported outside production, never used in its own file); `exportedForTests`,
 * code production runs inside its own module that tests also import to check it on its own; `unused`,
 * exports nobody imports (the module uses them itself, or nobody does).
 */
export function exportReport(dir = root) {
  const production = [...sources(join(dir, 'server')), ...sources(join(dir, 'client'))];
  const others = [...sources(join(dir, 'test')), ...sources(join(dir, 'bench')), ...sources(join(dir, 'scripts'))];
  const byProduction = new Map();
  const byOthers = new Map();
  const parsed = new Map(production.map((f) => [f, parse(f)]));
  for (const [f, sf] of parsed) importsOf(f, sf, byProduction);
  for (const f of others) importsOf(f, parse(f), byOthers);
  const entries = new Set(ENTRIES.map((e) => join(dir, e)));
  const testOnly = [];
  const exportedForTests = [];
  const unused = [];
  for (const [f, sf] of parsed) {
    if (entries.has(f) || !f.endsWith('.ts')) continue;
    const p = byProduction.get(f) ?? new Set();
    const o = byOthers.get(f) ?? new Set();
    for (const name of exportsOf(sf)) {
      if (p.has(name) || p.has('*')) continue;
      const line = `${relative(dir, f)}: ${name}`;
      if (!(o.has(name) || o.has('*'))) unused.push(line);
      else if (usedInside(sf, name)) exportedForTests.push(line);
      else testOnly.push(line);
    }
  }
  return { testOnly, exportedForTests, unused };
}

/** True when the file itself uses `name` beyond declaring it (so the code runs in production). */
function usedInside(sf, name) {
  let uses = 0;
  const visit = (n) => {
    if (ts.isIdentifier(n) && n.text === name) {
      const p = n.parent;
      const declares = p && p.name === n && (ts.isFunctionDeclaration(p) || ts.isVariableDeclaration(p) || ts.isClassDeclaration(p) || ts.isInterfaceDeclaration(p) || ts.isTypeAliasDeclaration(p) || ts.isEnumDeclaration(p));
      if (!declares && !(p && ts.isExportSpecifier(p))) uses++;
    }
    ts.forEachChild(n, visit);
  };
  visit(sf);
  return uses > 0;
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const { testOnly, exportedForTests, unused } = exportReport();
  console.log(`production exports that run only outside production (tests, bench, scripts): ${testOnly.length}`);
  for (const l of testOnly) console.log(`  ${l}`);
  if (process.argv.includes('--all')) {
    console.log(`exports used inside their own module and imported by tests, bench or scripts: ${exportedForTests.length}`);
    for (const l of exportedForTests) console.log(`  ${l}`);
    console.log(`exports imported by nobody: ${unused.length}`);
    for (const l of unused) console.log(`  ${l}`);
  }
  process.exit(testOnly.length > 0 ? 1 : 0);
}
