// What a statement carries beyond formula and result, drawn in the issued PDF from the same data
// and the same words as the app (components/calc/): citations of other sheets' issued results,
// the uncertainty and its budget, a sweep's table and a plot. Each is its own flat box in the cell
// (render.tsx, cellElements), so a long table can run over pages with its header repeated.
import { Text, View } from '@react-pdf/renderer';
import type { ReactElement, ReactNode } from 'react';
import { formatNumberText } from '@/lib/calc/format';
import { referenceText } from '@/lib/calc/reference-text';
import type { PlotData, ResolvedReference, StatementResult, StudyTable, UncertaintyResult } from '@/lib/calc/types';
import {
  BUDGET_COLUMNS,
  budgetRows,
  combinedText,
  monteCarloLines,
  standardUncertaintyText,
} from '@/lib/calc/uncertainty-text';
import { unitLabel } from '@/lib/calc/unit-label';
import { plotDescription } from '@/lib/plots/plot-figure';
import { tokens } from '@/tailwind.config';
import { MONO_FONT } from './fonts';
import { Group, Leaf } from './structure';

/** Draws a plot `width` points wide, at most `maxHeight` tall (lib/issue/pdf/svg-to-pdf.tsx, loaded only when a sheet has plots). */
export type FigureRenderer = (data: PlotData, width: number, options: { height: number }) => ReactElement;

const C = tokens;
const mono = { fontFamily: MONO_FONT };
// A4 text height is about 693 pt between the running head and the title block: a figure with its
// caption must fit one page, as a box that cannot split does.
const SPACETIME_MAX_HEIGHT = 380;
const CURVE_HEIGHT = 280;
/** Rows per breakable table box (react-pdf's pagination is happiest with boxes of moderate height). */
const ROWS_PER_BOX = 150;

/** A part of a cell that may run over a page break (render.tsx lets these wrap). */
export function Breakable({ children }: { children: ReactNode }): ReactElement {
  return <View>{children}</View>;
}

/** "from TPT2-CALC-0003 rev. B, Brho" under the statement, with a badge when not current. */
export function ReferenceLines({ references }: { references: ResolvedReference[] }): ReactElement | null {
  if (references.length === 0) return null;
  return (
    <View style={{ marginTop: 2 }}>
      {references.map((ref, i) => {
        const r = referenceText(ref);
        return (
          <View key={i} style={{ flexDirection: 'row', flexWrap: 'wrap', alignItems: 'center', marginTop: 1 }}>
            <Text style={{ fontSize: 8, color: C['ink-muted'] }}>{r.title ? `${r.text} (${r.title})` : r.text}</Text>
            {r.badge ? (
              <Text
                style={{
                  marginLeft: 5,
                  fontSize: 7,
                  fontWeight: 700,
                  color: C.caution,
                  backgroundColor: C['caution-soft'],
                  borderWidth: 0.75,
                  borderColor: C['caution-rule'],
                  paddingHorizontal: 3,
                }}
              >
                {r.badge.toUpperCase()}
              </Text>
            ) : null}
            {r.problem ? (
              <Text style={{ width: '100%', fontSize: 8, color: C.fail }}>{`Cannot be used: ${r.problem}`}</Text>
            ) : null}
          </View>
        );
      })}
    </View>
  );
}

/** The line under a result: "2.4297 ± 0.0012 (k = 2)", or an input's standard uncertainty. */
export function UncertaintyLine({ uncertainty }: { uncertainty: UncertaintyResult }): ReactElement {
  return (
    <Text style={{ fontSize: 8.5, marginTop: 1 }}>
      {uncertainty.kind === 'input' ? standardUncertaintyText(uncertainty) : uncertainty.text}
    </Text>
  );
}

function Caption({ children }: { children: string }) {
  return (
    <Leaf as="Caption">
      <Text style={{ fontSize: 7.5, fontWeight: 700, color: C.accent, marginBottom: 2 }}>{children}</Text>
    </Leaf>
  );
}

const th = {
  fontSize: 7,
  fontWeight: 700,
  color: C['ink-muted'],
  paddingVertical: 2,
  paddingHorizontal: 3,
  backgroundColor: '#f3f2ec',
};
const td = { fontSize: 7.5, paddingVertical: 1.5, paddingHorizontal: 3 };

/** The budget of a propagated uncertainty as a compact table, then u_c and U, the Monte Carlo check and any warning. */
function UncertaintyBudget({ line, uncertainty }: { line: number; uncertainty: UncertaintyResult }): ReactElement {
  const widths = ['16%', '17%', '17%', '20%', '17%', '13%'];
  const rows = budgetRows(uncertainty);
  return (
    <View style={{ paddingVertical: 3, borderTopWidth: 0.5, borderTopColor: C.rule }}>
      <Caption>{`Uncertainty budget, L${line} (JCGM 100, first order)`}</Caption>
      {rows.length ? (
        <View style={{ borderWidth: 0.5, borderColor: C['rule-strong'] }}>
          <Group as="Table">
            <View style={{ flexDirection: 'row' }}>
              <Group as="TR" inRow>
                {BUDGET_COLUMNS.map((title, i) => (
                  <Leaf key={i} as="TH" inRow>
                    <Text style={[th, { width: widths[i], textAlign: i === 0 ? 'left' : 'right' }]}>{title}</Text>
                  </Leaf>
                ))}
              </Group>
            </View>
            {rows.map((cells, r) => (
              <View key={r} style={{ flexDirection: 'row', borderTopWidth: 0.5, borderTopColor: C.rule }} wrap={false}>
                <Group as="TR" inRow>
                  {cells.map((cell, i) => (
                    <Leaf key={i} as="TD" inRow>
                      <Text
                        style={[td, i === 0 ? mono : {}, { width: widths[i], textAlign: i === 0 ? 'left' : 'right' }]}
                      >
                        {cell}
                      </Text>
                    </Leaf>
                  ))}
                </Group>
              </View>
            ))}
          </Group>
        </View>
      ) : null}
      <Leaf as="P">
        <Text style={{ fontSize: 8, marginTop: 2 }}>{combinedText(uncertainty)}</Text>
      </Leaf>
      {uncertainty.nonLinear ? (
        <Leaf as="P">
          <Text style={{ fontSize: 8, color: C['ink-muted'] }}>
            The model is not linear over ±2u of some input; the Monte Carlo result below is the one to rely on.
          </Text>
        </Leaf>
      ) : null}
      {uncertainty.monteCarlo
        ? monteCarloLines(uncertainty.monteCarlo, uncertainty.unit).map((l, i) => (
            <Leaf key={i} as="P">
              <Text style={{ fontSize: 8, color: C['ink-muted'] }}>{l}</Text>
            </Leaf>
          ))
        : null}
      {uncertainty.warning ? (
        <Leaf as="P">
          <Text
            style={{
              fontSize: 8,
              fontWeight: 700,
              color: C.caution,
              backgroundColor: C['caution-soft'],
              borderLeftWidth: 2,
              borderLeftColor: C['caution-rule'],
              paddingHorizontal: 4,
              paddingVertical: 1.5,
              marginTop: 2,
            }}
          >
            {`Caution: ${uncertainty.warning}`}
          </Text>
        </Leaf>
      ) : null}
    </View>
  );
}

/** A column heading: "T_kin (MeV)". */
function studyColumnTitle(c: StudyTable['columns'][number]): string {
  const u = unitLabel(c.unit);
  return u ? `${c.name} (${u})` : c.name;
}

/** A sweep's table: the header repeated at the top of each page it runs onto; a failed step says why. */
function StudyTablePdf({
  line,
  table,
  significantFigures,
}: {
  line: number;
  table: StudyTable;
  significantFigures: number;
}): ReactElement {
  const n = Math.max(1, table.columns.length);
  // Columns of numbers read best close together: the table takes what its columns need (at
  // least 60 % of the width, so a failed step's message has room), not the whole width.
  const tableWidth = `${Math.min(100, Math.max(60, n * 22))}%`;
  const width = `${100 / n}%`;
  const failed = table.errors.filter((e) => e !== null).length;
  const header = (
    // Repeated on each page the table runs onto, and tagged each time (a header row per page).
    <View fixed style={{ flexDirection: 'row', borderBottomWidth: 0.5, borderBottomColor: C['rule-strong'] }}>
      <Group as="TR" inRow>
        {table.columns.map((c, i) => (
          <Leaf key={i} as="TH" inRow>
            <Text style={[th, { width, textAlign: 'right' }]}>{studyColumnTitle(c)}</Text>
          </Leaf>
        ))}
      </Group>
    </View>
  );
  const boxes: ReactElement[] = [];
  for (let start = 0; start < Math.max(1, table.rows.length); start += ROWS_PER_BOX) {
    const rows = table.rows.slice(start, start + ROWS_PER_BOX);
    boxes.push(
      <View
        key={start}
        style={{
          width: tableWidth,
          borderWidth: 0.5,
          borderColor: C['rule-strong'],
          borderTopWidth: start === 0 ? 0.5 : 0,
        }}
      >
        {header}
        {rows.map((row, k) => {
          const r = start + k;
          const error = table.errors[r];
          return (
            <View
              key={r}
              style={{ flexDirection: 'row', borderTopWidth: k === 0 ? 0 : 0.5, borderTopColor: C.rule }}
              wrap={false}
            >
              <Group as="TR" inRow>
                {error ? (
                  <>
                    <Leaf as="TD" inRow>
                      <Text style={[td, mono, { width, textAlign: 'right' }]}>
                        {row[0] === null || row[0] === undefined ? '—' : formatNumberText(row[0], significantFigures)}
                      </Text>
                    </Leaf>
                    <Leaf as="TD" inRow>
                      <Text style={[td, { flex: 1, color: C.fail }]}>{`Step failed: ${error}`}</Text>
                    </Leaf>
                  </>
                ) : (
                  table.columns.map((_, i) => (
                    <Leaf key={i} as="TD" inRow>
                      <Text style={[td, mono, { width, textAlign: 'right' }]}>
                        {row[i] === null || row[i] === undefined ? '—' : formatNumberText(row[i]!, significantFigures)}
                      </Text>
                    </Leaf>
                  ))
                )}
              </Group>
            </View>
          );
        })}
      </View>,
    );
  }
  return (
    <View style={{ paddingVertical: 3, borderTopWidth: 0.5, borderTopColor: C.rule }}>
      <Leaf as="Caption">
        <Text minPresenceAhead={40} style={{ fontSize: 7.5, fontWeight: 700, color: C.accent, marginBottom: 2 }}>
          {`Sweep, L${line}: ${table.rows.length} step${table.rows.length === 1 ? '' : 's'}${failed ? `, ${failed} failed` : ''}`}
        </Text>
      </Leaf>
      <Group as="Table">{boxes}</Group>
    </View>
  );
}

/** A plot as vector graphics with its caption, kept on one page. */
export function PlotFigurePdf({
  line,
  plot,
  width,
  figure,
}: {
  line: number;
  plot: PlotData;
  width: number;
  figure: FigureRenderer | null;
}): ReactElement {
  const height = plot.kind === 'spacetime' ? SPACETIME_MAX_HEIGHT : CURVE_HEIGHT;
  return (
    <View style={{ paddingVertical: 3, borderTopWidth: 0.5, borderTopColor: C.rule }} wrap={false}>
      <Caption>{`Figure, L${line}`}</Caption>
      {/* The description printed under the figure is also its alternate text. */}
      <Leaf as="Figure" alt={plotDescription(plot)}>
        {figure ? figure(plot, width, { height }) : null}
      </Leaf>
      <Leaf as="P">
        <Text style={{ fontSize: 7.5, color: C['ink-muted'], marginTop: 1 }}>{plotDescription(plot)}</Text>
      </Leaf>
    </View>
  );
}

/** The boxes that follow a statement's own box, in order: figure, table, budget. */
export function statementExtras(
  st: StatementResult,
  options: { width: number; significantFigures: number; figure: FigureRenderer | null; keyPrefix: string },
): ReactElement[] {
  const out: ReactElement[] = [];
  if (st.plot)
    out.push(
      <PlotFigurePdf
        key={`${options.keyPrefix}-plot`}
        line={st.line}
        plot={st.plot}
        width={options.width}
        figure={options.figure}
      />,
    );
  if (st.table)
    out.push(
      <Breakable key={`${options.keyPrefix}-table`}>
        <StudyTablePdf line={st.line} table={st.table} significantFigures={options.significantFigures} />
      </Breakable>,
    );
  const u = st.uncertainty;
  if (u && u.kind === 'propagated' && (u.budget.length > 0 || u.monteCarlo || u.warning)) {
    const budget = <UncertaintyBudget line={st.line} uncertainty={u} />;
    out.push(
      u.budget.length > 20 ? (
        <Breakable key={`${options.keyPrefix}-budget`}>{budget}</Breakable>
      ) : (
        <View key={`${options.keyPrefix}-budget`}>{budget}</View>
      ),
    );
  }
  return out;
}
