// Any other statement: an expression whose value is shown (`p to GeV/c`).
import type { StatementForm } from '../statement';
import { compiledOnce } from '../statement';

export const expression: StatementForm = {
  name: 'expression',
  yieldsValue: true,
  shown: true,
  locatesErrors: true,
  recognise: () => true,
  messageNode: (st) => st.node!,
  evaluate: (st, run) => compiledOnce(st, () => st.node!).evaluate(run.scope),
};
