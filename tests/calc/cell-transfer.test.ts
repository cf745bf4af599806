// Results sent from a worker without the cells the server already has (lib/calc/sandbox/cell-transfer.ts):
// what the server rebuilds is always the whole result the engine made, never an older cell.
import { describe, expect, it } from 'vitest';
import { CellReceiver, CellSender } from '../../lib/calc/sandbox/cell-transfer';
import { jsonSizeAtMost } from '../../lib/calc/sandbox/protocol';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import type { CellInput } from '../../lib/calc/types';

// Invented inputs; the values are not what is checked here.
const sheet = (energy: string): CellInput[] => [
  { id: 'a', kind: 'calc', source: `E_k = ${energy}` },
  { id: 'b', kind: 'calc', source: 'E_2 = 2 * E_k' },
  { id: 'c', kind: 'calc', source: 'L_0 = 2 m' },
  { id: 'd', kind: 'text', source: 'A note.' },
];
const LIMIT = 32 * 1024 * 1024;
// The worker's side sees each result as a structured clone would carry it.
const carried = <T>(value: T): T => structuredClone(value);

describe('sending results between worker and server', () => {
  it('sends unchanged cells by number, and the server rebuilds the same result as a full one', () => {
    const engine = createSheetEngine();
    const sender = new CellSender();
    const receiver = new CellReceiver(100);
    const first = engine.evaluate(sheet('250 MeV'), { significantFigures: 6 });
    const one = sender.pack(first, false, LIMIT);
    expect(one.packed.cells.every((c) => typeof c === 'object')).toBe(true);
    expect(one.bytes).toBe(jsonSizeAtMost(first, LIMIT));
    expect(receiver.unpack(carried(one.packed))).toEqual(JSON.parse(JSON.stringify(first)));

    const second = engine.evaluate(sheet('300 MeV'), { significantFigures: 6 });
    const two = sender.pack(second, false, LIMIT);
    // Cells a and b changed (b reads E_k); c and the text cell d are the objects sent before.
    expect(two.packed.cells.map((c) => typeof c)).toEqual(['object', 'object', 'number', 'number']);
    expect(two.bytes).toBe(jsonSizeAtMost(second, LIMIT));
    const rebuilt = receiver.unpack(carried(two.packed))!;
    expect(rebuilt).toEqual(JSON.parse(JSON.stringify(second)));
    expect(rebuilt.ok).toBe(true);
    expect(rebuilt.cells[1].statements[0].value!.number).toBe(second.cells[1].statements[0].value!.number);

    // The text cell moved first: a new result, which says where it now stands.
    const moved = engine.evaluate([sheet('300 MeV')[3], ...sheet('300 MeV').slice(0, 3)], { significantFigures: 6 });
    expect(moved.cells[0]).not.toBe(second.cells[3]);
    expect(moved.cells[0]).toMatchObject({ id: 'd', index: 0, kind: 'text' });
    const three = sender.pack(moved, false, LIMIT);
    expect(typeof three.packed.cells[0]).toBe('object');
    expect(receiver.unpack(carried(three.packed))).toEqual(JSON.parse(JSON.stringify(moved)));
  });

  it('answers null when a cell named is no longer kept, and a full reply then rebuilds it', () => {
    const engine = createSheetEngine();
    const sender = new CellSender();
    const receiver = new CellReceiver(2);
    const first = engine.evaluate(sheet('250 MeV'), { significantFigures: 6 });
    receiver.unpack(carried(sender.pack(first, false, LIMIT).packed));
    const again = engine.evaluate(sheet('250 MeV'), { significantFigures: 6 });
    // Four cells sent, two kept: two of the numbers cannot be answered here.
    expect(receiver.unpack(carried(sender.pack(again, false, LIMIT).packed))).toBeNull();
    const full = sender.pack(again, true, LIMIT).packed;
    expect(full.cells.every((c) => typeof c === 'object')).toBe(true);
    expect(receiver.unpack(carried(full))).toEqual(JSON.parse(JSON.stringify(again)));
  });

  it('never matches numbers of a replaced worker, and freezes what it keeps', () => {
    const engine = createSheetEngine();
    const receiver = new CellReceiver(100);
    const before = new CellSender();
    receiver.unpack(
      carried(before.pack(engine.evaluate(sheet('250 MeV'), { significantFigures: 6 }), false, LIMIT).packed),
    );
    // A new worker (new generation) numbers from 1 again: its numbers must not find the old cells.
    const after = new CellSender();
    const other = createSheetEngine().evaluate(sheet('900 MeV'), { significantFigures: 6 });
    after.pack(other, false, LIMIT);
    const byNumber = after.pack(other, false, LIMIT).packed;
    expect(byNumber.cells.every((c) => typeof c === 'number')).toBe(true);
    expect(receiver.unpack(carried(byNumber))).toBeNull();
    const rebuilt = receiver.unpack(carried(after.pack(other, true, LIMIT).packed))!;
    expect(rebuilt.cells[0].statements[0].value!.text).toMatch(/900/);
    expect(Object.isFrozen(rebuilt.cells[0])).toBe(true);
    expect(Object.isFrozen(rebuilt.cells[0].statements[0].value)).toBe(true);
    expect(() => {
      (rebuilt.cells[0] as { ok: boolean }).ok = false;
    }).toThrow(TypeError);
  });
});
