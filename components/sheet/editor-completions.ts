// Completion for the calculation cell editor: names defined in the cells above, the built-in
// constants (with their description and provenance) and the relativistic library (with its
// signature and one-line summary). Pure: no React, no DOM, so tests can call it directly.
import type { Completion, CompletionContext, CompletionResult, CompletionSource } from '@codemirror/autocomplete';
import { CONSTANTS } from '@/lib/calc/constants';
import { LIBRARY, type CalcFunction } from '@/lib/calc/functions';
import { STUDY_FUNCTION_DOCS } from '@/lib/calc/study-functions';
import { NAME_CHAR, NAME_START } from '@/lib/calc/name-syntax';

export interface NameAbove {
  name: string;
  /** A short description: what the cell defines it as, its unit, its value. */
  summary?: string;
  /** For an input table (a CSV attachment): its columns, offered after `name.`. */
  columns?: ReadonlyArray<{ name: string; unit: string | null }>;
}

/** `name(param, …)` of a library function. */
export function functionSignature(fn: Pick<CalcFunction, 'name' | 'params'>): string {
  return `${fn.name}(${fn.params.map((p) => p.name).join(', ')})`;
}

function firstSentence(text: string): string {
  const flat = text.replace(/\s+/g, ' ').trim();
  const m = /^(.*?[.!?])(?:\s|$)/.exec(flat);
  return m ? m[1] : flat;
}

/** Every completion the editor offers, names above first (most recent definition wins). */
export function calcCompletionOptions(namesAbove: readonly NameAbove[] = []): Completion[] {
  const seen = new Set<string>();
  const options: Completion[] = [];
  for (const n of [...namesAbove].reverse()) {
    if (seen.has(n.name)) continue;
    seen.add(n.name);
    options.push({
      label: n.name,
      type: 'variable',
      detail: n.columns ? 'input table' : 'defined above',
      info: n.summary,
      boost: 2,
    });
  }
  for (const k of CONSTANTS) {
    if (seen.has(k.name)) continue;
    seen.add(k.name);
    options.push({
      label: k.name,
      type: 'constant',
      detail: k.unit === '' ? 'constant' : `constant, ${k.unit}`,
      info: `${k.description} — ${k.provenance}`,
      boost: 1,
    });
  }
  for (const f of LIBRARY) {
    if (seen.has(f.name)) continue;
    seen.add(f.name);
    options.push({
      label: f.name,
      type: 'function',
      detail: functionSignature(f).slice(f.name.length),
      info: `${functionSignature(f)} — ${firstSentence(f.doc.summary)}`,
      apply: `${f.name}(`,
    });
  }
  for (const d of STUDY_FUNCTION_DOCS) {
    if (seen.has(d.name) || !/^[A-Za-z]/.test(d.name)) continue;
    seen.add(d.name);
    options.push({
      label: d.name,
      type: 'function',
      detail: d.signature.slice(d.name.length),
      info: `${d.signature} — ${firstSentence(d.summary)}`,
      apply: `${d.name}(`,
    });
  }
  return options;
}

/** True when `before` (the line up to the cursor) ends inside a string or a `#` comment. */
export function inCommentOrString(before: string): boolean {
  let quote: string | null = null;
  for (let i = 0; i < before.length; i++) {
    const ch = before[i];
    if (quote) {
      if (ch === '\\') i++;
      else if (ch === quote) quote = null;
    } else if (ch === '"' || ch === "'") quote = ch;
    else if (ch === '#') return true;
  }
  return quote !== null;
}

// A name being typed may hold Greek letters (`Δp`, `θ_1`; name-syntax.ts).
const WORD = new RegExp(`[${NAME_START}_][${NAME_CHAR}]*$`);
const WHOLE_WORD = new RegExp(`^[${NAME_START}_][${NAME_CHAR}]*$`);

/**
 * The completion for a cursor at `pos` in `lineBefore` (the text of its line before it): null when
 * nothing should be offered (inside a comment or string, right after a digit, or no word typed and
 * not explicitly asked for).
 */
export function completeCalcAt(
  lineBefore: string,
  pos: number,
  explicit: boolean,
  namesAbove: readonly NameAbove[],
): CompletionResult | null {
  if (inCommentOrString(lineBefore)) return null;
  // After `table.`: the columns of that input table, with their units.
  const member = /(?:^|[^A-Za-z0-9_.])([A-Za-z][A-Za-z0-9_]*)\.([A-Za-z_][A-Za-z0-9_]*)?$/.exec(lineBefore);
  if (member) {
    const table = [...namesAbove].reverse().find((n) => n.name === member[1] && n.columns);
    if (!table) return null;
    return {
      from: pos - (member[2]?.length ?? 0),
      options: table.columns!.map((c) => ({
        label: c.name,
        type: 'property',
        detail: c.unit ? `column, ${c.unit}` : 'column, plain numbers',
        boost: 2,
      })),
      validFor: /^[A-Za-z_][A-Za-z0-9_]*$/,
    };
  }
  const word = WORD.exec(lineBefore);
  if (word && word.index > 0 && /[0-9.]/.test(lineBefore[word.index - 1])) return null;
  if (!word && !explicit) return null;
  const from = word ? pos - word[0].length : pos;
  return { from, options: calcCompletionOptions(namesAbove), validFor: WHOLE_WORD };
}

/** A CodeMirror completion source; `namesAbove` is read at each request so it can change. */
export function calcCompletionSource(namesAbove: () => readonly NameAbove[]): CompletionSource {
  return (context: CompletionContext) => {
    const line = context.state.doc.lineAt(context.pos);
    return completeCalcAt(line.text.slice(0, context.pos - line.from), context.pos, context.explicit, namesAbove());
  };
}
