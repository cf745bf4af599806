// How a version's results are stored (migration 20261205T000100): the results without their cells
// as `result_head`, and each cell's result once in the installation, as a row of `result_cells` keyed
// by the SHA-256 of its exact JSON text; the version lists its cells' digests in order
// (`result_cells`, 32 bytes each). A save that changes one cell stores one new cell row, not the
// whole document again. Reading goes through the database's `version_results(v)`, which gives the
// same document whichever way a version was stored (older versions keep their `results` column).
import { createHash } from 'node:crypto';
import { sql, type Transaction } from 'kysely';
import type { Database } from '@/db/schema';
import type { CellResult, SheetResult } from '@/lib/calc/types';

const DIGEST_BYTES = 32;

/**
 * Each cell result's digest, kept as long as the result object lives: the evaluator hands out the
 * same cell objects for results it keeps (lib/calc/sandbox/evaluator.ts), so a save that follows the
 * editor's evaluation of the same content hashes nothing again. Cell results are never changed once
 * made.
 */
const digests = new WeakMap<CellResult, Buffer>();

const sha256 = (text: string) => createHash('sha256').update(text, 'utf8').digest();

function digestOf(cell: CellResult, texts?: Map<CellResult, string>): Buffer {
  let digest = digests.get(cell);
  if (!digest) {
    const text = JSON.stringify(cell);
    digest = sha256(text);
    digests.set(cell, digest);
    texts?.set(cell, text);
  }
  return digest;
}

/** The columns of a version row that hold its results. */
export interface StoredResults {
  result_head: string;
  result_cells: Buffer;
}

/** What a version stores of its results: its columns, and the cell rows not stored before. */
export interface ResultRows extends StoredResults {
  /** The cells `known` does not list: their digests (hex) and the exact texts the digests were made from. */
  newHashes: string[];
  newTexts: string[];
}

/**
 * The version's result columns, and the cells of `results` that `known` (the digests of the version
 * saved before, or null) does not list: those a save must store (a cell any other version stored
 * already is skipped by the insert; rows are never changed).
 */
export function resultRows(results: SheetResult, known: Uint8Array | null): ResultRows {
  const { cells, ...head } = results;
  const texts = new Map<CellResult, string>();
  const list = cells.map((cell) => digestOf(cell, texts));
  const newHashes: string[] = [];
  const newTexts: string[] = [];
  // Most cells are where they were, unchanged: compared in place; any other is looked for anywhere
  // in the version before's list (at a digest's boundary), then among those stored by this save.
  const before = known ? Buffer.from(known.buffer, known.byteOffset, known.byteLength) : null;
  const adding = new Set<string>();
  cells.forEach((cell, i) => {
    const at = i * DIGEST_BYTES;
    if (before && at + DIGEST_BYTES <= before.length && list[i].equals(before.subarray(at, at + DIGEST_BYTES))) return;
    if (before && listedIn(before, list[i])) return;
    const h = list[i].toString('hex');
    if (adding.has(h)) return;
    adding.add(h);
    newHashes.push(h);
    // The exact text the digest was made from (a digest kept from earlier: the same text again).
    newTexts.push(texts.get(cell) ?? JSON.stringify(cell));
  });
  return { result_head: JSON.stringify(head), result_cells: Buffer.concat(list), newHashes, newTexts };
}

/**
 * Stores the cells of `results` that `known` does not list and returns the version's columns.
 * Within `trx`, before the version row is inserted.
 */
export async function storeResults(
  trx: Transaction<Database>,
  results: SheetResult,
  known: Uint8Array | null,
): Promise<StoredResults> {
  const { newHashes, newTexts, ...stored } = resultRows(results, known);
  if (newHashes.length > 0) {
    await sql`
      insert into result_cells (hash, result)
      select decode(t.h, 'hex'), t.r::json from unnest(${newHashes}::text[], ${newTexts}::text[]) as t(h, r)
      on conflict (hash) do nothing`.execute(trx);
  }
  return stored;
}

/** Whether `digests` (32 bytes each) lists `digest`. */
function listedIn(digests: Buffer, digest: Buffer): boolean {
  for (let at = digests.indexOf(digest); at !== -1; at = digests.indexOf(digest, at + 1))
    if (at % DIGEST_BYTES === 0) return true;
  return false;
}
