// Parsing a calculation cell: one statement per line, comments stripped, `±` rewritten, unit
// literals bound to placeholders, the tree analysed for the names it uses, and the statement
// recognised by its form (forms/). Parsed cells are cached by their text (per engine).
import type { MathNode } from 'mathjs';
import { bidiRefusalReason, findBidiControl } from '../bidi-controls';
import { lintExpression, mayNeedLint } from '../lint';
import { LIMITS } from '../limits';
import { REFUSED_NAMES, type EngineMath } from '../math-instance';
import { parseMessage } from '../messages';
import { checkDefinitionName } from '../names';
import { NAME_CHAR, NAME_START } from '../name-syntax';
import { stripComment } from '../references';
import { extractUnitLiterals, UNIT_PLACEHOLDER_PREFIX } from '../unit-literals';
import { FORMS } from './forms';
import { blankStatement, type AnyNode, type ParsedStatement } from './statement';

/** `name = value ± u`: made once (not global, so exec keeps no position between lines). */
const PLUS_MINUS_LINE = new RegExp(`^\\s*([${NAME_START}][${NAME_CHAR}]*)\\s*=(?!=)([^±]+)±([^±]+)$`);

/**
 * `x = value ± u` written as `x = uncertain(value, u)` for the parser; a `±` anywhere else is refused.
 * Returns the line unchanged when it holds no `±`.
 */
function rewritePlusMinus(line: string): { text: string; error: string | null } {
  // `+/-` is read as `±` for keyboards without it (it means nothing else in a formula).
  const text = line.includes('+/-') ? line.replaceAll('+/-', '±') : line;
  if (!text.includes('±')) return { text, error: null };
  const m = PLUS_MINUS_LINE.exec(text);
  if (!m || /["']/.test(text))
    return { text, error: '± gives an input its standard uncertainty: write name = value ± u, one ± per line' };
  return { text: `${m[1]} = uncertain(${m[2].trim()}, ${m[3].trim()})`, error: null };
}

/** The names a statement uses, calls and reads as units; refused functions and bad conversions. */
function analyse(em: EngineMath, node: AnyNode, statement: ParsedStatement): void {
  const uses = new Set<string>();
  const unitNamed = new Set<string>();
  const fnNamed = new Set<string>();
  const calls = new Set<string>();
  const visit = (n: AnyNode, locals: ReadonlySet<string>) => {
    switch (n.type) {
      case 'SymbolNode': {
        const name = n.name!;
        if (REFUSED_NAMES.has(name)) {
          statement.staticError ??= `The function ${name} is not available in calculation sheets.`;
          return;
        }
        if (
          name.startsWith(UNIT_PLACEHOLDER_PREFIX) ||
          locals.has(name) ||
          em.constants.has(name) ||
          em.isMathConstant(name)
        )
          return;
        if (em.isUnitName(name)) unitNamed.add(name);
        else uses.add(name);
        return;
      }
      case 'FunctionNode': {
        const fn = n.fn as AnyNode;
        if (fn && fn.type === 'SymbolNode') {
          const name = fn.name!;
          if (REFUSED_NAMES.has(name)) {
            statement.staticError ??= `The function ${name} is not available in calculation sheets.`;
            return;
          }
          if (!locals.has(name)) {
            calls.add(name);
            if (em.isFunctionName(name)) fnNamed.add(name);
            else uses.add(name);
          }
        } else if (fn) visit(fn, locals);
        for (const a of n.args ?? []) visit(a, locals);
        return;
      }
      case 'OperatorNode': {
        if ((n.op === 'to' || n.op === 'in') && n.args) {
          visit(n.args[0], locals);
          n.args[1].traverse((u: MathNode) => {
            const un = u as AnyNode;
            if (un.type === 'SymbolNode' && !un.name!.startsWith(UNIT_PLACEHOLDER_PREFIX) && !em.isUnitName(un.name!)) {
              statement.staticError ??= `\`${un.name}\` after "${n.op}" is not a unit`;
            }
          });
          return;
        }
        for (const a of n.args ?? []) visit(a, locals);
        return;
      }
      case 'FunctionAssignmentNode': {
        const params = (n.params as string[]) ?? [];
        visit(n.expr!, new Set([...locals, ...params]));
        return;
      }
      case 'AccessorNode': {
        // `table.column` (a column of an input table) and `v[k]` (an element of a list).
        const index = n.index as { dotNotation?: boolean; dimensions?: AnyNode[] } | undefined;
        const object = n.object as AnyNode;
        if (index?.dotNotation && object.type !== 'SymbolNode') {
          statement.staticError ??= 'a column is read from an input table by its name: table.column';
          return;
        }
        visit(object, locals);
        if (index?.dotNotation) {
          const column = (index.dimensions?.[0] as { value?: unknown } | undefined)?.value;
          statement.columns.push({ table: object.name!, column: String(column) });
        }
        if (!index?.dotNotation) for (const d of index?.dimensions ?? []) visit(d, new Set([...locals, 'end']));
        return;
      }
      case 'AssignmentNode':
      case 'BlockNode':
        statement.staticError ??= 'only one plain statement per line is allowed here';
        return;
      default:
        n.forEach((child: MathNode) => visit(child as AnyNode, locals));
    }
  };
  visit(node, new Set());
  statement.uses = [...uses];
  statement.unitNamed = [...unitNamed];
  statement.fnNamed = [...fnNamed];
  statement.calls = [...calls];
}

/** Reads one line into a statement: its tree, the names it uses and its form. */
function readStatement(em: EngineMath, st: ParsedStatement, text: string): void {
  try {
    const pm = rewritePlusMinus(text);
    if (pm.error) {
      st.parseError = pm.error;
      return;
    }
    const { text: rewritten, literals } = extractUnitLiterals(pm.text, em.isUnitName);
    st.unitLiterals = literals;
    st.node = em.parse(rewritten) as AnyNode;
  } catch (error) {
    // mathjs's position counts the unit placeholders; the message is said for the line as written.
    st.parseError = parseMessage(error, text, em.parse);
    return;
  }
  const node = st.node;
  let recognisable = true;
  if (node.type === 'AssignmentNode') {
    const target = node.object!;
    if (target.type !== 'SymbolNode' || node.index) {
      st.staticError = 'only plain names can be defined (no indexes or properties)';
      recognisable = false;
    } else {
      st.kind = 'definition';
      st.defines = target.name!;
      analyse(em, node.value!, st);
    }
  } else if (node.type === 'FunctionAssignmentNode') {
    st.kind = 'function';
    st.defines = node.name!;
    analyse(em, node, st);
  } else {
    analyse(em, node, st);
  }
  if (recognisable) st.form = FORMS.find((f) => f.recognise(st, node, em)) ?? null;
  if (st.defines) st.staticError ??= checkDefinitionName(st.defines, em);
  if (mayNeedLint(text)) {
    try {
      st.lint = lintExpression(node.type === 'AssignmentNode' ? node.value! : node, em);
    } catch {
      st.lint = [];
    }
  }
}

export function createCellParser(em: EngineMath) {
  const cache = new Map<string, ParsedStatement[]>();
  function parseCell(source: string): ParsedStatement[] {
    const cached = cache.get(source);
    if (cached) return cached;
    if (source.length > LIMITS.maxCellSourceChars) {
      const st = blankStatement(1, source.slice(0, 80));
      st.parseError = `the cell is longer than ${LIMITS.maxCellSourceChars} characters`;
      return [st];
    }
    const statements: ParsedStatement[] = [];
    const lines = source.split(/\r?\n/);
    for (const [i, raw] of lines.entries()) {
      const text = stripComment(raw).trim();
      // A bidirectional control character, even in a comment, can make the line read differently
      // from what is evaluated (lib/calc/bidi-controls.ts): the line is an error, never evaluated.
      const control = findBidiControl(raw);
      if (!text && !control) continue;
      const st = blankStatement(i + 1, raw.trim());
      statements.push(st);
      if (control) {
        st.parseError = bidiRefusalReason(control, false);
        continue;
      }
      if (statements.length > LIMITS.maxStatementsPerCell) {
        st.parseError = `a cell holds at most ${LIMITS.maxStatementsPerCell} statements`;
        break;
      }
      if (text.length > LIMITS.maxLineChars) {
        st.parseError = `a line holds at most ${LIMITS.maxLineChars} characters`;
        continue;
      }
      readStatement(em, st, text);
    }
    if (cache.size >= LIMITS.parseCacheEntries) cache.delete(cache.keys().next().value as string);
    cache.set(source, statements);
    return statements;
  }
  return { parseCell, clear: () => cache.clear() };
}
