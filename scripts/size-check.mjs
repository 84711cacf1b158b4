#!/usr/bin/env node
// Checks that every TypeScript source in server/ and client/ fits in a reader's head: no file over
// MAX_FILE lines and no function (declaration, method, arrow or function expression) over MAX_FUNCTION
// lines. Prints each offender as FILE:LINE: what; exits 1 when there is one.
import { readdirSync, readFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import ts from 'typescript';

const MAX_FILE = 600;
const MAX_FUNCTION = 80;
const root = join(fileURLToPath(new URL('.', import.meta.url)), '..');
const folders = ['server', 'client'];

function* sources(dir) {
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, entry.name);
    if (entry.isDirectory()) {
      if (entry.name !== 'node_modules') yield* sources(p);
    } else if (entry.isFile() && entry.name.endsWith('.ts') && !entry.name.endsWith('.d.ts')) yield p;
  }
}

function functionName(node, sf) {
  if (node.name) return node.name.getText(sf);
  const parent = node.parent;
  if (parent && ts.isVariableDeclaration(parent)) return parent.name.getText(sf);
  if (parent && ts.isPropertyAssignment(parent)) return parent.name.getText(sf);
  return '(anonymous)';
}

export function offenders(file, text) {
  const found = [];
  const lines = text.split('\n').length - (text.endsWith('\n') ? 1 : 0);
  if (lines > MAX_FILE) found.push({ line: 1, what: `file has ${lines} lines (limit ${MAX_FILE})` });
  const sf = ts.createSourceFile(file, text, ts.ScriptTarget.Latest, true);
  const visit = (node) => {
    if (ts.isFunctionLike(node) && node.body) {
      const start = sf.getLineAndCharacterOfPosition(node.getStart(sf)).line;
      const end = sf.getLineAndCharacterOfPosition(node.getEnd()).line;
      const n = end - start + 1;
      if (n > MAX_FUNCTION) found.push({ line: start + 1, what: `function ${functionName(node, sf)} has ${n} lines (limit ${MAX_FUNCTION})` });
    }
    ts.forEachChild(node, visit);
  };
  visit(sf);
  return found;
}

/** Every file the check reads, relative to the repository root: each TypeScript source under server/ and client/. */
export function checkedFiles() {
  return folders.flatMap((folder) => [...sources(join(root, folder))].map((file) => relative(root, file)));
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  let bad = 0;
  for (const file of checkedFiles()) {
    for (const o of offenders(file, readFileSync(join(root, file), 'utf8'))) {
      console.log(`${file}:${o.line}: ${o.what}`);
      bad++;
    }
  }
  if (bad > 0) {
    console.error(`size check: ${bad} offender${bad === 1 ? '' : 's'}`);
    process.exit(1);
  }
  console.error('size check: every file and function is within its limit');
}
