// The architecture's walls, checked on every import (see DEVELOPERS.md, "Walls"):
//   1. lib/calc imports nothing of the project outside lib/calc (it is the pure engine the worker, CLI and
//      browser all load);
//   2. a 'use client' module takes only types from server modules: no runtime import may reach, through any
//      chain of project modules, pg, kysely, pg-boss, server-only or a Node built-in ('use server' modules are
//      exempt: Next sends the browser a reference to the action, not its code);
//   3. app/ never writes SQL: no kysely import and no query-builder call (selectFrom, insertInto, …) in app/;
//   4. db/ imports lib/ only from the demo seed (db/seed.ts, db/starters.ts);
//   5. migrations import only kysely.
import fs from 'node:fs';
import path from 'node:path';
import { builtinModules } from 'node:module';
import { fileURLToPath } from 'node:url';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const SERVER_ONLY_PACKAGES = [
  'pg',
  'kysely',
  'pg-boss',
  'server-only',
  '@node-rs/argon2',
  'nodemailer',
  '@aws-sdk/client-s3',
];
const BUILTINS = new Set(builtinModules);
const DEMO_SEED = new Set(['db/seed.ts', 'db/starters.ts']);
const QUERY_BUILDER = new Set(['selectFrom', 'insertInto', 'updateTable', 'deleteFrom', 'replaceInto', 'mergeInto']);
const EXTENSIONS = ['.ts', '.tsx', '.mjs', '.js', '/index.ts', '/index.tsx'];

const rel = (abs) => path.relative(ROOT, abs).split(path.sep).join('/');

function packageName(spec) {
  const parts = spec.split('/');
  return spec.startsWith('@') ? parts.slice(0, 2).join('/') : parts[0];
}

function isServerOnlyPackage(spec) {
  if (spec.startsWith('node:') || BUILTINS.has(spec) || BUILTINS.has(spec.split('/')[0])) return true;
  return SERVER_ONLY_PACKAGES.includes(packageName(spec));
}

/** The project file an import names, or null for a package. */
function resolveProject(spec, fromFile) {
  let base;
  if (spec.startsWith('@/')) base = path.join(ROOT, spec.slice(2));
  else if (spec.startsWith('.')) base = path.resolve(path.dirname(fromFile), spec);
  else return null;
  if (fs.existsSync(base) && fs.statSync(base).isFile()) return base;
  for (const ext of EXTENSIONS) if (fs.existsSync(base + ext)) return base + ext;
  return base; // unresolved: still a project path, judged by where it points
}

const directiveCache = new Map();
function directiveOf(file) {
  if (!directiveCache.has(file)) {
    let d;
    try {
      const head = fs.readFileSync(file, 'utf8').replace(/^(\s|\/\/[^\n]*\n|\/\*[\s\S]*?\*\/)*/, '');
      const m = /^['"]use (client|server)['"]/.exec(head);
      d = m ? m[1] : null;
    } catch {
      d = null;
    }
    directiveCache.set(file, d);
  }
  return directiveCache.get(file);
}

/** Runtime (not type-only) import specifiers of a file, read with a light scan. */
const runtimeImportCache = new Map();
function runtimeImports(file) {
  if (runtimeImportCache.has(file)) return runtimeImportCache.get(file);
  let src;
  try {
    src = fs.readFileSync(file, 'utf8');
  } catch {
    runtimeImportCache.set(file, []);
    return [];
  }
  src = src.replace(/\/\*[\s\S]*?\*\//g, '').replace(/^\s*\/\/.*$/gm, '');
  const out = [];
  const re =
    /(?:^|[;\n])\s*(import|export)\s+([^'";]*?)\s*from\s*['"]([^'"]+)['"]|(?:^|[;\n])\s*import\s*['"]([^'"]+)['"]|import\(\s*['"]([^'"]+)['"]\s*\)/g;
  for (const m of src.matchAll(re)) {
    if (m[4] || m[5]) {
      out.push(m[4] ?? m[5]);
      continue;
    }
    const clause = m[2].trim();
    if (/^type\s/.test(clause)) continue;
    const braces = /^\{([\s\S]*)\}$/.exec(clause);
    if (braces && braces[1].split(',').every((s) => !s.trim() || /^type\s/.test(s.trim()))) continue;
    out.push(m[3]);
  }
  runtimeImportCache.set(file, out);
  return out;
}

/** The chain from `file` to a server-only package through runtime imports, or null. */
function serverChain(file, seen = new Set()) {
  if (seen.has(file)) return null;
  seen.add(file);
  if (directiveOf(file) === 'server') return null;
  for (const spec of runtimeImports(file)) {
    if (isServerOnlyPackage(spec)) return [spec];
    const target = resolveProject(spec, file);
    if (!target || !fs.existsSync(target)) continue;
    const rest = serverChain(target, seen);
    if (rest) return [rel(target), ...rest];
  }
  return null;
}

function isTypeOnly(node) {
  if (node.importKind === 'type' || node.exportKind === 'type') return true;
  const specs = node.specifiers ?? [];
  return specs.length > 0 && specs.every((s) => s.importKind === 'type' || s.exportKind === 'type');
}

const rule = {
  meta: {
    type: 'problem',
    docs: { description: "The architecture's walls between lib/calc, client components, app/, db/ and migrations." },
    schema: [],
  },
  create(context) {
    const file = context.filename;
    const where = rel(file);
    const inCalc = where.startsWith('lib/calc/');
    const inApp = where.startsWith('app/');
    const inDb = where.startsWith('db/');
    const inMigrations = where.startsWith('migrations/');
    const isClient = /^['"]use client['"]/.test(
      context.sourceCode.text.replace(/^(\s|\/\/[^\n]*\n|\/\*[\s\S]*?\*\/)*/, ''),
    );

    function check(node, spec) {
      if (typeof spec !== 'string') return;
      const target = resolveProject(spec, file);
      const typeOnly = isTypeOnly(node);
      if (inCalc && target && !rel(target).startsWith('lib/calc/'))
        context.report({ node, message: `lib/calc imports nothing of the project outside lib/calc ('${spec}').` });
      if (inMigrations && spec !== 'kysely')
        context.report({
          node,
          message: `Migrations import only kysely ('${spec}'): a migration must not change when the code does.`,
        });
      if (inDb && !DEMO_SEED.has(where) && target && rel(target).startsWith('lib/'))
        context.report({ node, message: `db/ imports lib/ only from the demo seed ('${spec}').` });
      if (inApp && !typeOnly && packageName(spec) === 'kysely')
        context.report({ node, message: `app/ never writes SQL: use a lib/ function instead of importing kysely.` });
      if (isClient && !typeOnly) {
        if (isServerOnlyPackage(spec)) {
          context.report({ node, message: `A client component may not import '${spec}' (server only).` });
        } else if (target && fs.existsSync(target)) {
          const chain = serverChain(target);
          if (chain)
            context.report({
              node,
              message: `A client component takes only types from server modules: '${spec}' reaches ${[rel(target), ...chain].join(' → ')}. Use \`import type\` or move the code.`,
            });
        }
      }
    }

    return {
      ImportDeclaration: (node) => check(node, node.source.value),
      ExportNamedDeclaration: (node) => node.source && check(node, node.source.value),
      ExportAllDeclaration: (node) => check(node, node.source.value),
      ImportExpression: (node) => node.source.type === 'Literal' && check(node, node.source.value),
      CallExpression(node) {
        if (!inApp) return;
        const callee = node.callee;
        if (
          callee.type === 'MemberExpression' &&
          callee.property.type === 'Identifier' &&
          QUERY_BUILDER.has(callee.property.name)
        )
          context.report({
            node,
            message: `app/ never writes SQL: '${callee.property.name}' belongs in a lib/ function.`,
          });
      },
    };
  },
};

export default { meta: { name: 'worldsheet' }, rules: { walls: rule } };
