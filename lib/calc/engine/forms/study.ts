// `sweep(input, values, r1, …)`, `plot(…)` and `spacetime(t, values, x1, …)`: each value of the input
// re-runs the statements that depend on it (studies.ts), so a row equals a single evaluation with
// that value. The table or plot is the result; the statement has no value of its own. On a plot,
// a named result that does not depend on the input is a design limit (a horizontal line), and
// `dataPoints(table.x, table.y)` overlays the rows of two columns of an input table (studies.ts).
import { computeStudy } from '../../studies';
import { STUDY_STATEMENTS, type StudyStatement } from '../../study-functions';
import type { AnyNode, StatementForm } from '../statement';
import { calledName } from '../statement';

/** `table.column` as its two names, or null. */
function columnOf(node: AnyNode): { table: string; column: string } | null {
  const index = node.index as { dotNotation?: boolean; dimensions?: Array<{ value?: unknown }> } | undefined;
  const object = node.object as AnyNode | undefined;
  if (node.type !== 'AccessorNode' || !index?.dotNotation || object?.type !== 'SymbolNode') return null;
  return { table: object.name!, column: String(index.dimensions?.[0]?.value) };
}

export const study: StatementForm = {
  name: 'sweep, plot or space-time diagram',
  yieldsValue: false,
  shown: false,
  locatesErrors: false,
  recognise(st, node) {
    const fnName = calledName(node);
    if (st.kind !== 'expression' || !fnName || !(STUDY_STATEMENTS as readonly string[]).includes(fnName)) return false;
    const kind = fnName as StudyStatement;
    st.kind = kind === 'sweep' ? 'sweep' : 'plot';
    const args = node.args ?? [];
    // After the values: names of results, and on a plot `dataPoints(table.x, table.y)` overlays.
    const rest = args.slice(2);
    const overlays: NonNullable<typeof st.study>['overlays'] = [];
    const targetNodes: typeof rest = [];
    for (const a of rest) {
      if (calledName(a) !== 'dataPoints') {
        targetNodes.push(a);
        continue;
      }
      if (kind !== 'plot') {
        st.staticError ??= `${fnName} takes names of results; dataPoints(…) is drawn only by plot(…)`;
        continue;
      }
      const cols = (a.args ?? []).map(columnOf);
      if (cols.length !== 2 || cols.some((c) => c === null)) {
        st.staticError ??=
          'dataPoints takes two columns of an attached table, x then y: dataPoints(energies.T, energies.Brho)';
        continue;
      }
      overlays.push({ x: cols[0]!, y: cols[1]! });
    }
    const names = [args[0], ...targetNodes].map((a) => (a?.type === 'SymbolNode' ? a.name! : null));
    if (args.length < 3 || targetNodes.length === 0 || names.some((n) => n === null)) {
      st.staticError ??= `write ${fnName}(input, values, result1, result2, …) with the names of an input and of results defined above`;
    } else if (targetNodes.length + overlays.length > 12) {
      st.staticError ??= `${fnName} shows at most 12 results; split it`;
    } else {
      st.study = { kind, input: names[0]!, targets: names.slice(1) as string[], overlays };
    }
    return true;
  },
  messageNode: (st) => st.node!,
  evaluate(st, run, _cell, result) {
    const { math, scope } = run;
    st.compiledParts ??= [st.node!.args![1].compile()];
    const listValue = st.compiledParts[0].evaluate(scope);
    const list = math.isMatrix(listValue)
      ? (listValue as { toArray(): unknown[] }).toArray()
      : Array.isArray(listValue)
        ? listValue
        : null;
    if (!list || list.some((x) => Array.isArray(x) || math.isMatrix(x)))
      throw new Error('the second argument is the list of values to sweep, e.g. steps(70 MeV, 250 MeV, 20 MeV)');
    if (list.length > 2000) throw new Error('a sweep or a plot takes at most 2000 values');
    const { input, targets } = st.study!;
    if (run.tables.has(input) || !run.chain().index.has(input))
      throw new Error(`\`${input}\` must be a value defined above to be swept`);
    for (const t of targets) {
      if (!run.isDefined(t) || run.tables.has(t)) throw new Error(`\`${t}\` is not a result defined above`);
    }
    // Each overlay's columns: the values the sheet reads (quantities) and the table's own numbers.
    const overlayNodes = st.node!.args!.slice(2).filter((a) => calledName(a) === 'dataPoints');
    const overlays = st.study!.overlays.map((o, k) => {
      const column = (ref: { table: string; column: string }, at: 0 | 1) => {
        const value = overlayNodes[k].args![at].compile().evaluate(scope);
        const table = run.tables.get(ref.table)?.columns.find((c) => c.name === ref.column);
        const label = `${ref.table}.${ref.column}`;
        if (!table || !math.isMatrix(value))
          throw new Error(`\`${label}\` is not a column of an input table; dataPoints reads attached data tables`);
        return { label, values: (value as { toArray(): unknown[] }).toArray(), raw: table };
      };
      return { x: column(o.x, 0), y: column(o.y, 1) };
    });
    const memo = new Map<string, boolean>();
    const out = computeStudy(math, run.reevaluator(), scope, {
      kind: st.study!.kind,
      input,
      values: list,
      targets,
      overlays,
      dependsOnInput: (t: string) => t === input || run.dependsOn(t, input, memo),
    });
    result.table = out.table;
    result.plot = out.plot;
    return undefined;
  },
};
