// Sending results from an evaluation worker to the server without sending again what it already
// has. The engine answers an unchanged cell with the very result object it made before (its cell
// cache), so after an edit most of a sheet's results are objects this worker has sent already. The
// worker numbers each cell result it sends (CellSender); a later reply carries that number instead
// of the cell, and the server (CellReceiver) answers it from the cells it keeps. A one-cell edit of
// a 500-cell sheet then crosses the thread boundary as a few KiB instead of the whole 450 KiB, and
// the server's cells keep their identity from one evaluation to the next (what is derived from a
// cell, such as the digest a save stores it under, is worked out once).
//
// The receiver keeps a bounded number of cells; a reply naming a cell it no longer keeps is not
// guessed at: the request is sent again in full (`full`), which the worker answers from its cache.
// A worker replaced after a limit starts a new generation: numbers are never matched across
// generations. Received cells are frozen, so that no reader can change a result another evaluation
// shares.
import { randomUUID } from 'node:crypto';
import type { CellResult, SheetResult } from '../types';
import { jsonSizeAtMost } from './protocol';

/** A result as a worker sends it: each cell either in full or as the number it was sent under before. */
export interface PackedResult extends Omit<SheetResult, 'cells'> {
  /** The worker's generation: numbers mean something only within one. */
  generation: string;
  cells: Array<CellResult | number>;
  /** The number of each cell sent in full (the same length as `cells`; 0 where `cells` holds a number). */
  numbers: number[];
}

/** The worker's side: numbers the cell results it sends. */
export class CellSender {
  readonly generation = randomUUID();
  private readonly numbers = new WeakMap<CellResult, number>();
  private readonly sizes = new WeakMap<CellResult, number>();
  private next = 1;

  /**
   * `result` with every cell sent before replaced by its number (all in full when `full`), and its
   * size as JSON as protocol.ts's jsonSizeAtMost counts it (each cell's size is counted once).
   */
  pack(result: SheetResult, full: boolean, limit: number): { packed: PackedResult; bytes: number } {
    const cells: Array<CellResult | number> = [];
    const numbers: number[] = [];
    let bytes = jsonSizeAtMost({ ...result, cells: [] }, limit) + result.cells.length;
    for (const cell of result.cells) {
      let size = this.sizes.get(cell);
      if (size === undefined) {
        size = jsonSizeAtMost(cell, limit);
        this.sizes.set(cell, size);
      }
      bytes += size;
      const number = this.numbers.get(cell);
      if (number !== undefined && !full) {
        cells.push(number);
        numbers.push(0);
      } else {
        const n = number ?? this.next++;
        this.numbers.set(cell, n);
        cells.push(cell);
        numbers.push(n);
      }
    }
    return { packed: { ...result, generation: this.generation, cells, numbers }, bytes };
  }
}

/** The server's side, one per worker thread: the cells received, most recently used last. */
export class CellReceiver {
  private generation = '';
  private readonly cells = new Map<number, CellResult>();

  constructor(private readonly limit: number) {}

  /** The whole result, or null when a cell it names is no longer kept here (ask again in full). */
  unpack(packed: PackedResult): SheetResult | null {
    if (packed.generation !== this.generation) {
      this.cells.clear();
      this.generation = packed.generation;
    }
    const { generation, numbers, cells: sent, ...head } = packed;
    void generation;
    const cells: CellResult[] = new Array(sent.length);
    let missing = false;
    for (let i = 0; i < sent.length; i++) {
      const c = sent[i];
      if (typeof c === 'number') {
        const kept = this.cells.get(c);
        if (!kept) {
          missing = true;
          continue;
        }
        this.cells.delete(c);
        this.cells.set(c, kept);
        cells[i] = kept;
      } else {
        deepFreeze(c);
        this.cells.delete(numbers[i]);
        this.cells.set(numbers[i], c);
        cells[i] = c;
      }
    }
    while (this.cells.size > this.limit) this.cells.delete(this.cells.keys().next().value as number);
    return missing ? null : { ...head, cells };
  }
}

function deepFreeze(value: unknown): void {
  if (value === null || typeof value !== 'object' || Object.isFrozen(value)) return;
  Object.freeze(value);
  for (const v of Object.values(value)) deepFreeze(v);
}
