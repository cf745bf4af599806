// `sweep(input, values, r1, …)`, `plot(…)` and `spacetime(t, values, x1, …)`: each value of the input
// re-runs the statements that depend on it (studies.ts), so a row equals a single evaluation with
// that value. The table or plot is the result; the statement has no value of its own.
import { computeStudy } from '../../studies';
import { STUDY_STATEMENTS, type StudyStatement } from '../../study-functions';
import type { StatementForm } from '../statement';
import { calledName } from '../statement';

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
    const names = [args[0], ...args.slice(2)].map((a) => (a?.type === 'SymbolNode' ? a.name! : null));
    if (args.length < 3 || names.some((n) => n === null)) {
      st.staticError ??= `write ${fnName}(input, values, result1, result2, …) with the names of an input and of results defined above`;
    } else if (args.length - 2 > 12) {
      st.staticError ??= `${fnName} shows at most 12 results; split it`;
    } else {
      st.study = { kind, input: names[0]!, targets: names.slice(1) as string[] };
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
    const memo = new Map<string, boolean>();
    const out = computeStudy(math, run.reevaluator(), scope, {
      kind: st.study!.kind,
      input,
      values: list,
      targets,
      dependsOnInput: (t: string) => t === input || run.dependsOn(t, input, memo),
    });
    result.table = out.table;
    result.plot = out.plot;
    return undefined;
  },
};
