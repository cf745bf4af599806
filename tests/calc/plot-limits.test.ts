// Design limits and data overlays of plots in the engine: a result that does not depend on the
// plot's input is a horizontal line at exactly its value in the axis unit, and dataPoints(table.x,
// table.y) overlays the rows of an attached data table in the plot's units; what cannot be drawn
// on the plot's axes is refused with a message naming the result or column.
import { describe, expect, it } from 'vitest';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import type { CellInput, InputTable, SheetResult, StatementResult } from '../../lib/calc/types';

const engine = createSheetEngine();
const calc = (...sources: string[]): CellInput[] =>
  sources.map((source, i) => ({ id: `c${i + 1}`, kind: 'calc', source }));
const run = (cells: CellInput[], tables: InputTable[] = []): SheetResult =>
  engine.evaluate(cells, { significantFigures: 6, tables });
const statement = (r: SheetResult, name: string): StatementResult => {
  const st = r.cells.flatMap((c) => c.statements).find((s) => s.name === name);
  if (!st) throw new Error(`no statement defines ${name}`);
  return st;
};
const plotOf = (r: SheetResult) => {
  const st = r.cells.flatMap((c) => c.statements).find((s) => s.kind === 'plot');
  if (!st) throw new Error('no plot');
  return st;
};

// A proton beam through a dipole of 1.5 m bending radius (a test set-up, no published source).
const BEAM =
  'T_kin = 250 MeV\np = momentumFromKinetic(T_kin, m_p)\nBrho = magneticRigidity(p, q_e) to T*m\nrho = 1.5 m\nB_dip = Brho / rho to T';

/** A data table as lib/attachments/csv-table.ts reads an attachment; numbers illustrative (no published source). */
function table(name: string, columns: InputTable['columns']): InputTable {
  return { name, sha256: name.padEnd(64, '0').slice(0, 64), fileName: `${name}.csv`, columns };
}
const ENERGIES = table('energies', [
  { name: 'T', unit: 'MeV', values: [70.1, 120.35, 180.7, 249.9] },
  { name: 'Brho', unit: 'T m', values: [1.2271, 1.6418, 2.0388, 2.4311] },
  { name: 'B', unit: 'T', values: [0.818, 1.0945, 1.3592, 1.6207] },
  { name: 'L', unit: 'm', values: [1, 2, 3, 4] },
]);

describe('design limits on a plot', () => {
  it('draws a result that does not depend on the input as a limit at its value, not as a curve', () => {
    const r = run(calc(BEAM, 'B_max = 1.8 T\nplot(T_kin, points(70 MeV, 250 MeV, 91), B_dip, B_max)'));
    const st = plotOf(r);
    expect(st.error).toBeNull();
    const plot = st.plot!;
    expect(plot.series.map((s) => s.name)).toEqual(['B_dip']);
    expect(plot.series[0].points).toHaveLength(91);
    expect(plot.y).toEqual({ label: 'B_dip', unit: 'T' });
    expect(plot.limits).toEqual([{ name: 'B_max', value: 1.8 }]);
  });

  it('puts a limit written in another unit at the value the sheet converts it to in the axis unit', () => {
    const r = run(
      calc(BEAM, 'B_max = 1800 mT\nB_max_T = B_max to T\nplot(T_kin, points(70 MeV, 250 MeV, 11), B_dip, B_max)'),
    );
    const plot = plotOf(r).plot!;
    expect(plot.y.unit).toBe('T');
    // The same number the sheet shows for `B_max to T`, to the bit.
    expect(plot.limits![0].value).toBe(statement(r, 'B_max_T').value!.number);
  });

  it('takes the axis unit from the first curve even when a limit is named first', () => {
    const r = run(calc(BEAM, 'Brho_max = 2500 T*mm\nplot(T_kin, points(70 MeV, 250 MeV, 5), Brho_max, Brho)'));
    const plot = plotOf(r).plot!;
    expect(plot.y.unit).toBe('T m');
    expect(plot.limits![0].name).toBe('Brho_max');
    expect(plot.limits![0].value).toBeCloseTo(2.5, 14);
  });

  it('refuses a limit of another dimension than the curves, saying which is the limit', () => {
    const r = run(calc(BEAM, 'L_max = 2 m\nplot(T_kin, points(70 MeV, 250 MeV, 5), B_dip, L_max)'));
    const error = plotOf(r).error!;
    expect(error).toMatch(/`L_max` does not depend on `T_kin`, so it is drawn as a design limit/);
    expect(error).toMatch(/in m and `B_dip` is in T/);
  });

  it('refuses a plot whose results are all limits', () => {
    const r = run(calc(BEAM, 'B_max = 1.8 T\nplot(T_kin, points(70 MeV, 250 MeV, 5), B_max)'));
    expect(plotOf(r).error).toMatch(/none of `B_max` depends on `T_kin`; a plot needs at least one curve/);
  });
});

describe('data table points on a plot', () => {
  it('overlays the rows of a table in the axes units exactly as the table has them', () => {
    const r = run(calc(BEAM, 'plot(T_kin, points(70 MeV, 250 MeV, 19), Brho, dataPoints(energies.T, energies.Brho))'), [
      ENERGIES,
    ]);
    const st = plotOf(r);
    expect(st.error).toBeNull();
    expect(st.plot!.series.map((s) => s.name)).toEqual(['Brho']);
    expect(st.plot!.data).toEqual([
      {
        name: 'energies.Brho',
        x: 'energies.T',
        y: 'energies.Brho',
        points: [
          [70.1, 1.2271],
          [120.35, 1.6418],
          [180.7, 2.0388],
          [249.9, 2.4311],
        ],
      },
    ]);
  });

  it('converts a column in another unit to the axis unit', () => {
    const gev = table('gev', [{ name: 'T', unit: 'GeV', values: [0.07, 0.25] }]);
    const mm = table('tm', [{ name: 'Brho', unit: 'T mm', values: [1227.1, 2431.1] }]);
    const r = run(calc(BEAM, 'plot(T_kin, points(70 MeV, 250 MeV, 5), Brho, dataPoints(gev.T, tm.Brho))'), [gev, mm]);
    const points = plotOf(r).plot!.data![0].points;
    expect(points[0][0]).toBeCloseTo(70, 12);
    expect(points[1][0]).toBeCloseTo(250, 12);
    expect(points[0][1]).toBeCloseTo(1.2271, 14);
    expect(points[1][1]).toBeCloseTo(2.4311, 14);
  });

  it('draws limits and data together', () => {
    const r = run(
      calc(
        BEAM,
        'B_max = 1.8 T\nplot(T_kin, points(70 MeV, 250 MeV, 91), B_dip, B_max, dataPoints(energies.T, energies.B))',
      ),
      [ENERGIES],
    );
    const plot = plotOf(r).plot!;
    expect(plot.limits).toEqual([{ name: 'B_max', value: 1.8 }]);
    expect(plot.data![0].points.map((p) => p[1])).toEqual([0.818, 1.0945, 1.3592, 1.6207]);
  });

  it('refuses a column of the wrong dimension, naming it', () => {
    const y = run(calc(BEAM, 'plot(T_kin, points(70 MeV, 250 MeV, 5), Brho, dataPoints(energies.T, energies.L))'), [
      ENERGIES,
    ]);
    expect(plotOf(y).error).toMatch(/`energies.L` is in m, not of the dimension of the curves \(`Brho`\) \(in T·m\)/);
    const x = run(calc(BEAM, 'plot(T_kin, points(70 MeV, 250 MeV, 5), Brho, dataPoints(energies.L, energies.Brho))'), [
      ENERGIES,
    ]);
    expect(plotOf(x).error).toMatch(/`energies.L` is in m, not of the dimension of the input `T_kin` \(in MeV\)/);
  });

  it('refuses columns of unequal lengths and empty columns, naming them', () => {
    const short = table('short', [{ name: 'Brho', unit: 'T m', values: [1.2, 1.6] }]);
    const empty = table('empty', [{ name: 'Brho', unit: 'T m', values: [] }]);
    const r = run(calc(BEAM, 'plot(T_kin, points(70 MeV, 250 MeV, 5), Brho, dataPoints(energies.T, short.Brho))'), [
      ENERGIES,
      short,
    ]);
    expect(plotOf(r).error).toMatch(/`energies.T` has 4 rows and `short.Brho` has 2/);
    const e = run(calc(BEAM, 'plot(T_kin, points(70 MeV, 250 MeV, 5), Brho, dataPoints(energies.T, empty.Brho))'), [
      ENERGIES,
      empty,
    ]);
    expect(plotOf(e).error).toMatch(/`empty.Brho` is empty/);
  });

  it('refuses a missing column, a non-column argument, and dataPoints outside a plot', () => {
    const missing = run(
      calc(BEAM, 'plot(T_kin, points(70 MeV, 250 MeV, 5), Brho, dataPoints(energies.T, energies.Bx))'),
      [ENERGIES],
    );
    expect(plotOf(missing).error).toMatch(/no column `Bx`/);
    const notColumn = run(calc(BEAM, 'plot(T_kin, points(70 MeV, 250 MeV, 5), Brho, dataPoints(T_kin, Brho))'));
    expect(plotOf(notColumn).error).toMatch(/dataPoints takes two columns of an attached table/);
    const sweep = run(calc(BEAM, 'sweep(T_kin, [100, 200] MeV, Brho, dataPoints(energies.T, energies.Brho))'), [
      ENERGIES,
    ]);
    expect(sweep.cells[1].statements[0].error).toMatch(/dataPoints\(…\) is drawn only by plot/);
    const alone = run(calc(BEAM, 'x = dataPoints(energies.T, energies.Brho)'), [ENERGIES]);
    expect(alone.cells[1].statements[0].error).toMatch(/overlays the rows of a data table on a plot/);
  });
});

describe('plots with limits and data after edits', () => {
  it('give the same answer from the cell cache as from scratch when a limit or the table changes', () => {
    const cached = createSheetEngine();
    const sheet = (limit: string) =>
      calc(
        BEAM,
        `B_max = ${limit}`,
        'plot(T_kin, points(70 MeV, 250 MeV, 7), B_dip, B_max, dataPoints(energies.T, energies.B))',
      );
    const edited = table('energies', [
      { name: 'T', unit: 'MeV', values: [70.1, 249.9] },
      { name: 'B', unit: 'T', values: [0.9, 1.7] },
    ]);
    const steps: Array<[string, InputTable]> = [
      ['1.8 T', ENERGIES],
      ['1.9 T', ENERGIES],
      ['1.9 T', { ...edited, sha256: 'e'.repeat(64) }],
    ];
    for (const [limit, tbl] of steps) {
      const options = { significantFigures: 6, tables: [tbl] };
      const incremental = cached.evaluate(sheet(limit), options);
      const scratch = createSheetEngine().evaluate(sheet(limit), options);
      expect(JSON.stringify({ ...incremental, evaluatedCells: 0 })).toBe(
        JSON.stringify({ ...scratch, evaluatedCells: 0 }),
      );
      expect(plotOf(incremental).plot!.limits![0].value).toBe(Number(limit.split(' ')[0]));
      expect(plotOf(incremental).plot!.data![0].points.map((p) => p[1])).toEqual(
        tbl.columns.find((c) => c.name === 'B')!.values,
      );
    }
  });
});
