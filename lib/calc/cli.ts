// The command-line evaluator: `npm run -s calc -- FILE [--json]`.
// With --json it prints one JSON document and nothing else:
//   {"ok": bool, "values": {NAME: {"value": number|string|boolean, "unit": string|null}},
//    "cells": [{"index": n, "ok": bool, "error": string|null, "warnings": [string]}]}
// `warnings` holds the physics lint's warnings of the cell's statements, each "line N: …" (a name
// read as a unit or a mathematical constant where a physical constant is likely meant; see
// lib/calc/lint.ts); they do not change `ok` or the exit code.
// Exit code 0 when every cell evaluated, 1 when any cell has an error, 2 when the file cannot be
// read or is not a sheet. It evaluates through the same sandboxed workers as the server.
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { cellsOf, DEFAULT_SIGNIFICANT_FIGURES, parseSheetFile, SheetFileError } from './sheet-file';
import { SandboxedEvaluator, sandboxOptionsFromEnv } from './sandbox/evaluator';
import type { SheetResult } from './types';

const root = path.join(path.dirname(fileURLToPath(import.meta.url)), '..', '..');

export interface CliOutput {
  ok: boolean;
  values: Record<string, { value: number | string | boolean; unit: string | null }>;
  cells: Array<{ index: number; ok: boolean; error: string | null; warnings: string[] }>;
}

export function toCliOutput(result: SheetResult): CliOutput {
  const values: CliOutput['values'] = {};
  for (const cell of result.cells) {
    for (const st of cell.statements) {
      if (!st.name || !st.value || st.error) continue;
      const v = st.value;
      values[st.name] = {
        value: v.number ?? (typeof v.raw === 'boolean' || typeof v.raw === 'string' ? v.raw : v.text),
        unit: v.unit,
      };
    }
  }
  return {
    ok: result.ok,
    values,
    cells: result.cells.map((c) => ({ index: c.index, ok: c.ok, error: c.error, warnings: c.warnings ?? [] })),
  };
}

function table(result: SheetResult, title: string): string {
  const lines = [`${title}`, `engine: ${result.engineVersion}; constants: ${result.constantsEdition}`, ''];
  for (const cell of result.cells) {
    if (cell.kind === 'text') continue;
    lines.push(`cell ${cell.index + 1}${cell.ok ? '' : '  ERROR'}`);
    for (const st of cell.statements) {
      const label = st.name ?? st.source;
      const shown = st.error
        ? `error: ${st.error}`
        : st.criterion
          ? `${st.criterion.pass ? 'PASS' : 'FAIL'} (${st.criterion.marginText})`
          : (st.value?.text ?? '');
      lines.push(`  ${label.padEnd(28)} ${shown}`);
      for (const w of st.warnings ?? []) lines.push(`  ${''.padEnd(28)} warning: ${w}`);
    }
  }
  return lines.join('\n');
}

async function main(argv: string[]): Promise<number> {
  const json = argv.includes('--json');
  const file = argv.find((a) => !a.startsWith('--'));
  const failRead = (message: string) => {
    if (json) process.stdout.write(`${JSON.stringify({ ok: false, error: message, values: {}, cells: [] })}\n`);
    else process.stderr.write(`calc: ${message}\n`);
    return 2;
  };
  if (!file) return failRead('usage: npm run -s calc -- FILE [--json]');
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (error) {
    return failRead(`cannot read ${file}: ${(error as Error).message}`);
  }
  let sheet;
  try {
    sheet = parseSheetFile(text);
  } catch (error) {
    if (error instanceof SheetFileError) return failRead(`${file}: ${error.message}`);
    throw error;
  }
  // A command's own entry point: lib/calc may not import lib/config.ts, so it hands over its environment.
  const evaluator = new SandboxedEvaluator({ ...sandboxOptionsFromEnv(process.env), workers: 1, root });
  try {
    const result = await evaluator.evaluate(cellsOf(sheet), {
      significantFigures: sheet.significantFigures ?? DEFAULT_SIGNIFICANT_FIGURES,
      displayUnits: sheet.displayUnits,
    });
    if (json) process.stdout.write(`${JSON.stringify(toCliOutput(result))}\n`);
    else process.stdout.write(`${table(result, sheet.title)}\n`);
    return result.ok ? 0 : 1;
  } finally {
    await evaluator.close();
  }
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  main(process.argv.slice(2)).then(
    (code) => process.exit(code),
    (error) => {
      process.stderr.write(`calc: ${(error as Error).message}\n`);
      process.exit(2);
    },
  );
}
