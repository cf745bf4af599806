// POST /api/evaluate, called through its route handler.
import { describe, expect, it } from 'vitest';
import { POST } from '../../app/api/evaluate/route';

const post = (body: unknown, raw = false) =>
  POST(new Request('http://localhost/api/evaluate', { method: 'POST', body: raw ? (body as string) : JSON.stringify(body), headers: { 'content-type': 'application/json' } }));

describe('POST /api/evaluate', () => {
  it('returns per-cell, per-statement results', async () => {
    const res = await post({ cells: [{ id: 'a', kind: 'calc', source: 'L_0 = 10 m\nL_0 to cm' }, { id: 'b', kind: 'text', source: 'prose' }] });
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.ok).toBe(true);
    expect(body.cells[0].statements[1].value).toMatchObject({ number: 1000, unit: 'cm' });
    expect(body.cells[1]).toMatchObject({ id: 'b', kind: 'text', ok: true });
    expect(body.constantsEdition).toBe('CODATA 2022; SI 2019 exact constants');
  });

  it('answers 400 with a clear message for bad input', async () => {
    let res = await post('{"cells": [', true);
    expect(res.status).toBe(400);
    expect((await res.json()).error.message).toBe('The request body is not valid JSON.');
    res = await post({ cells: [{ id: 'A B', kind: 'calc', source: '1' }] });
    expect(res.status).toBe(400);
    expect((await res.json()).error.message).toBe('cells.0.id: cell ids are short lowercase tokens');
    res = await post({ cells: [{ id: 'a', kind: 'calc', source: '1' }, { id: 'a', kind: 'calc', source: '2' }] });
    expect((await res.json()).error.message).toBe('cells: cell ids must be unique');
    res = await post({ cells: 'x' });
    expect(res.status).toBe(400);
  });

  it('answers 413 for a body over the size limit', async () => {
    const res = await post({ cells: [{ id: 'a', kind: 'calc', source: 'x'.repeat(3 * 1024 * 1024) }] });
    expect(res.status).toBe(413);
  });
});
