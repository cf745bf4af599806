// `f(x, y) = …`: a function of the sheet, callable in later statements.
import type { StatementForm } from '../statement';
import { compiledOnce } from '../statement';

export const functionDefinition: StatementForm = {
  name: 'function definition',
  yieldsValue: false,
  shown: false,
  locatesErrors: true,
  recognise: (st) => st.kind === 'function',
  messageNode: (st) => st.node!,
  evaluate(st, run, cell) {
    const value = compiledOnce(st, () => st.node!).evaluate(run.scope);
    cell.values.set(st.defines!, run.scope.get(st.defines!));
    return value;
  },
};
