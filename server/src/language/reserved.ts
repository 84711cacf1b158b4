/**
 * Names a file may not define with `let`: JavaScript object machinery (a `let __proto__` would reach
 * the prototype of any plain-object scope) and names the expression sandbox refuses. One list, read
 * where names are defined (the model), offered (completion) and renamed (the language server).
 */
const RESERVED = new Set([
  '__proto__',
  'prototype',
  'constructor',
  'hasOwnProperty',
  'isPrototypeOf',
  'propertyIsEnumerable',
  'toLocaleString',
  'toString',
  'valueOf',
  '__defineGetter__',
  '__defineSetter__',
  '__lookupGetter__',
  '__lookupSetter__',
  'evaluate',
  'compile',
  'parse',
  'simplify',
  'derivative',
  'import',
  'createUnit',
  'config',
  'reviver',
  'resolve',
]);

/** True when `name` may not be defined (nor offered, nor accepted as a new name in a rename). */
export function isReservedName(name: string): boolean {
  return RESERVED.has(name);
}
