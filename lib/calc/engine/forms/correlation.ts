// `correlation(x, y, r)`: the correlation coefficient of two inputs that carry an uncertainty, r a
// number literal. Every such pair of the sheet is found before evaluation (plan.ts) and holds for
// every result, wherever the statement stands; the first statement for a pair counts.
import type { AnyNode, StatementForm } from '../statement';
import { calledName } from '../statement';

function literal(a: AnyNode | undefined): number | null {
  if (a?.type === 'ConstantNode' && typeof (a as AnyNode & { value?: unknown }).value === 'number')
    return (a as AnyNode & { value: number }).value;
  if (a?.type === 'OperatorNode' && a.fn === 'unaryMinus' && a.args?.length === 1) {
    const inner = literal(a.args[0]);
    return inner === null ? null : -inner;
  }
  return null;
}

export const correlation: StatementForm = {
  name: 'correlation',
  yieldsValue: false,
  shown: true,
  locatesErrors: false,
  recognise(st, node) {
    if (st.kind !== 'expression' || calledName(node) !== 'correlation') return false;
    const args = node.args ?? [];
    const r = literal(args[2]);
    if (args.length !== 3 || args[0].type !== 'SymbolNode' || args[1].type !== 'SymbolNode' || r === null) {
      st.staticError ??=
        'write correlation(x, y, r) with the names of two inputs that carry an uncertainty and a number r';
    } else if (!(Math.abs(r) <= 1)) {
      st.staticError ??= 'a correlation coefficient lies between −1 and 1';
    } else if (args[0].name === args[1].name) {
      st.staticError ??= 'a correlation is between two different inputs';
    } else {
      st.correlation = { a: args[0].name!, b: args[1].name!, r };
    }
    return true;
  },
  messageNode: (st) => st.node!,
  evaluate(st, run, cell) {
    const { a, b, r } = st.correlation!;
    const { plan } = run;
    for (const name of [a, b]) {
      if (!run.isDefined(name)) throw new Error(`\`${name}\` is not defined above`);
      if (!plan.staticallyUncertain.has(name))
        throw new Error(`\`${name}\` carries no standard uncertainty (write it as ${name} = value ± u)`);
    }
    const first = plan.correlations.get(plan.pairKey(a, b))!;
    if (first.cell !== cell.index || first.line !== st.line)
      throw new Error(
        `the correlation of \`${a}\` and \`${b}\` is already given in cell ${first.cell + 1}, line ${first.line}`,
      );
    return r;
  },
};
