// `x = expression`: a value given a name. A function written as a value is refused: functions are
// defined with `f(x) = …` (function-definition.ts).
import type { StatementForm } from '../statement';
import { compiledOnce } from '../statement';

export const definition: StatementForm = {
  name: 'definition',
  yieldsValue: true,
  shown: true,
  locatesErrors: true,
  recognise: (st) => st.kind === 'definition',
  messageNode: (st) => st.node!.value!,
  evaluate(st, run, cell) {
    // Below an uncertain input, propagation re-evaluates the statement with the same compiled form
    // (run.ts, chain), so it is kept rather than compiled again there.
    const value = compiledOnce(st, () => st.node!.value!, run.inputU.size > 0).evaluate(run.scope);
    if (typeof value === 'function') throw new Error('define functions with the form f(x) = …');
    run.define(st.defines!, value, cell);
    return value;
  },
};
