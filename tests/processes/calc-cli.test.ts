// The command-line evaluator's contract (product brief, "Sheet files and the command-line
// evaluator"): one JSON document on stdout, values at full precision, exit codes 0, 1 and 2.
// Expected numbers are the hand-checked arithmetic of the statements under test (common practice),
// with unit conversions by SI prefix definitions (SI Brochure, 9th ed., §3); a physical reference
// value names its source beside it.
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';

const dir = mkdtempSync(path.join(tmpdir(), 'ws-cli-'));
function file(name: string, content: unknown): string {
  const p = path.join(dir, name);
  writeFileSync(p, typeof content === 'string' ? content : JSON.stringify(content));
  return p;
}
function calc(...args: string[]) {
  const r = spawnSync('npm', ['run', '-s', 'calc', '--', ...args], {
    cwd: process.cwd(),
    encoding: 'utf8',
    timeout: 60_000,
  });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe('npm run -s calc -- FILE --json', () => {
  it('prints one JSON document with full-precision values and exits 0 when every cell evaluates', () => {
    const f = file('ok.json', {
      title: 'Proton speed',
      cells: [
        { kind: 'text', source: 'A proton at 250 MeV.' },
        { kind: 'calc', source: 'T_kin = 250 MeV\nx = 1/3\nok_1 = 1 < 2\nlabel = "gantry"' },
      ],
    });
    const r = calc(f, '--json');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(r.stdout.trim().split('\n')).toHaveLength(1);
    expect(out.ok).toBe(true);
    expect(out.values.T_kin).toEqual({ value: 250, unit: 'MeV' });
    expect(out.values.x).toEqual({ value: 1 / 3, unit: null }); // full double precision, not rounded for display
    expect(out.values.ok_1).toEqual({ value: true, unit: null });
    expect(out.values.label).toEqual({ value: 'gantry', unit: null });
    expect(out.cells).toEqual([
      { index: 0, ok: true, error: null, warnings: [] },
      { index: 1, ok: true, error: null, warnings: [] },
    ]);
  });

  it('lists the physics lint’s warnings per cell as strings, without changing ok or the exit code', () => {
    // Issue 15: `h * c / (500 nm)` is a plain number because mathjs's h is the hour (common practice:
    // dimensional analysis); `hbar` is the hectobar.
    const f = file('lint.json', {
      title: 'Photon',
      cells: [
        { kind: 'calc', source: 'E_ph = h * c / (500 nm)\nx_1 = 2\np_1 = hbar * c' },
        { kind: 'calc', source: 'E_2 = h_P * c / (500 nm)' },
      ],
    });
    const r = calc(f, '--json');
    expect(r.code).toBe(0);
    const out = JSON.parse(r.stdout);
    expect(out.ok).toBe(true);
    expect(out.cells[0].warnings).toEqual([
      'line 1: `h` here is the hour (a unit of time); the Planck constant is `h_P`',
      'line 3: `hbar` here is the hectobar (a unit of pressure, 10⁷ Pa); the reduced Planck constant is `hbar_P` (or `ħ`)',
    ]);
    expect(out.cells[1].warnings).toEqual([]);
    // The readable table shows them under the statement.
    expect(calc(f).stdout).toContain('warning: `h` here is the hour (a unit of time); the Planck constant is `h_P`');
  });

  it('exits 1 and names the error when a cell fails', () => {
    const r = calc(
      file('bad.json', {
        title: 'x',
        cells: [
          { kind: 'calc', source: 'a = 1 m + 1 s' },
          { kind: 'calc', source: 'b_1 = 2' },
        ],
      }),
      '--json',
    );
    expect(r.code).toBe(1);
    const out = JSON.parse(r.stdout);
    expect(out.ok).toBe(false);
    expect(out.cells[0]).toMatchObject({
      index: 0,
      ok: false,
      error: expect.stringMatching(/cannot add `1 m` \(a length\) and `1 s` \(a time\)/),
    });
    expect(out.values.b_1).toEqual({ value: 2, unit: null });
  });

  it.each([
    ['not JSON', 'not json {'],
    ['not a sheet', { cells: 'nope' }],
    ['a cell of an unknown kind', { title: 'x', cells: [{ kind: 'code', source: '1' }] }],
  ])('exits 2 for a file that is %s', (_, content) => {
    const r = calc(file(`bad-${Math.random()}.json`, content), '--json');
    expect(r.code).toBe(2);
    expect(JSON.parse(r.stdout)).toMatchObject({ ok: false, values: {}, cells: [] });
  });

  it('exits 2 when the file cannot be read', () => {
    expect(calc(path.join(dir, 'missing.json'), '--json').code).toBe(2);
  });

  it('prints a readable table without --json', () => {
    const r = calc(
      file('table.json', { title: 'Rigidity', cells: [{ kind: 'calc', source: 'B_1 = 1.5 T\nB_1 < 1.8 T' }] }),
    );
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('Rigidity');
    // Six significant figures, trailing zeros kept (SI Brochure 9th ed. §5.4.4; common practice).
    expect(r.stdout).toMatch(/B_1\s+1\.500\u202f00 T/);
    expect(r.stdout).toMatch(/PASS \(margin 16\.7 % of the limit/);
  });
});
