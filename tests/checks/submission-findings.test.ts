// What a version must have acknowledged before it is submitted: cell errors, failed criteria,
// engine warnings, and design inputs that do not match the value the cell was evaluated with.
import { describe, expect, it } from 'vitest';
import { createSheetEngine } from '../../lib/calc/sheet-engine';
import { checkDesignInput, submissionFindings, unacknowledged } from '../../lib/checks/submission-findings';
import { emptyRecord, type VersionContent } from '../../lib/sheets/content';
import { contentHash } from '../../lib/sheets/content-hash';

const engine = createSheetEngine();

function content(cells: string[], inputs: VersionContent['record']['inputs'] = []): VersionContent {
  return {
    schema: 1,
    title: 'Findings',
    safetyRelated: false,
    significantFigures: 6,
    record: { ...emptyRecord(), inputs },
    cells: cells.map((source, i) => ({ id: `c${i + 1}`, kind: 'calc' as const, source })),
    attachments: [],
  };
}
const evaluate = (c: VersionContent) => engine.evaluate(c.cells, { significantFigures: c.significantFigures });

describe('design inputs linked to cells', () => {
  // A proton kinetic energy of 150 MeV (a common practice beam energy) written in joules:
  // 150 MeV × 1.602 176 634 × 10⁻¹⁹ J/eV (SI 2019, exact) = 2.403 264 951 × 10⁻¹¹ J.
  it('matches the same kinetic energy written in another unit, to the digits written', () => {
    const c = content(
      ['T = 150 MeV'],
      [
        {
          name: 'Proton kinetic energy',
          value: '2.403265e-11 J',
          source: 'Beam specification',
          sourceRevision: 'A',
          cell: 'T',
        },
      ],
    );
    const findings = submissionFindings(c, evaluate(c));
    expect(findings).toEqual([]);
    const v = evaluate(c).cells[0].statements[0].value;
    expect(checkDesignInput('2.403265e-11 J', 'T', v).status).toBe('match');
    expect(checkDesignInput('150 MeV', 'T', v).status).toBe('match');
    expect(checkDesignInput('0.15 GeV', 'T', v).status).toBe('match');
    // 2.4033e-11 J is 150.002 MeV: within half a unit of its last digit (0.00005e-11 J), so it matches.
    expect(checkDesignInput('2.4033e-11 J', 'T', v).status).toBe('match');
    // 2.404e-11 J is 150.04 MeV: more than half a unit of its last digit away.
    expect(checkDesignInput('2.404e-11 J', 'T', v).status).toBe('mismatch');
  });

  it('reports a mismatch, units of another dimension and a name the sheet does not define', () => {
    const c = content(
      ['T = 160 MeV'],
      [
        {
          name: 'Proton kinetic energy',
          value: '150 MeV',
          source: 'Beam specification',
          sourceRevision: 'A',
          cell: 'T',
        },
        { name: 'Proton momentum', value: '150 MeV', source: 'Beam specification', sourceRevision: 'A', cell: 'p' },
        { name: 'Energy as a length', value: '150 m', source: 'Beam specification', sourceRevision: 'A', cell: 'T' },
        { name: 'Not linked', value: '3 m', source: 'Survey', sourceRevision: 'B' },
      ],
    );
    const findings = submissionFindings(c, evaluate(c));
    expect(findings.map((f) => [f.key, f.kind])).toEqual([
      ['input:0', 'design-input'],
      ['input:1', 'design-input'],
      ['input:2', 'design-input'],
    ]);
    expect(findings[0].message).toMatch(/record gives 150 MeV, the sheet uses 160 MeV/);
    expect(findings[0].message).toMatch(/relative difference of 0\.0667/);
    expect(findings[1].message).toMatch(/defines no quantity named p/);
    expect(findings[2].message).toMatch(/units differ/);
  });

  it('keeps the hash of a version whose inputs name no cell', () => {
    const old = content(['x = 1 m'], [{ name: 'Spacing', value: '1 m', source: 'Survey', sourceRevision: 'A' }]);
    const linked = content(
      ['x = 1 m'],
      [{ name: 'Spacing', value: '1 m', source: 'Survey', sourceRevision: 'A', cell: 'x' }],
    );
    // The canonical form has no "cell" key when absent, so the hash is the one stored before the field existed.
    expect(JSON.stringify(old)).not.toContain('"cell"');
    expect(contentHash(old)).not.toBe(contentHash(linked));
    expect(contentHash(old)).toBe(contentHash(JSON.parse(JSON.stringify(old))));
  });
});

describe('findings to acknowledge', () => {
  it('lists each evaluation error, failed criterion and engine warning, and what is still unacknowledged', () => {
    const c = content(['a = 1 m\nb = a + 1 s\nc = undefinedName * 2', 'a < 0.5 m', 'E = h * 2']);
    const findings = submissionFindings(c, evaluate(c));
    const kinds = findings.map((f) => f.kind);
    expect(kinds.filter((k) => k === 'cell-error').length).toBeGreaterThanOrEqual(2);
    expect(kinds).toContain('criterion-failed');
    expect(kinds).toContain('lint-warning');
    const { missing } = unacknowledged(
      findings,
      findings.slice(1).map((f) => ({ key: f.key, text: 'Reviewed.' })),
    );
    expect(missing.map((f) => f.key)).toEqual([findings[0].key]);
    expect(unacknowledged(findings, [{ key: findings[0].key, text: '   ' }]).missing.length).toBe(findings.length);
    expect(unacknowledged(findings, [{ key: 'error:zz:1', text: 'x' }]).unknown).toEqual(['error:zz:1']);
  });
});
