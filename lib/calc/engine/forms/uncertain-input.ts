// `x = value ± u` (rewritten by the parser to `x = uncertain(value, u)`): an input with its standard
// uncertainty, of the value's dimension, finite and not negative. Results that depend on it get a
// propagated uncertainty (lib/calc/studies.ts).
import type { Unit } from 'mathjs';
import { siOf } from '../../studies';
import type { StatementForm } from '../statement';
import { calledName, compiledOnce } from '../statement';

export const uncertainInput: StatementForm = {
  name: 'uncertain input',
  yieldsValue: true,
  shown: true,
  locatesErrors: true,
  recognise(st, node) {
    if (st.kind !== 'definition' || calledName(node.value!) !== 'uncertain') return false;
    if ((node.value!.args?.length ?? 0) !== 2)
      st.staticError ??= 'write an input with its standard uncertainty as name = value ± u';
    else st.uncertain = true;
    return true;
  },
  messageNode: (st) => st.node!.value!.args![0],
  evaluate(st, run, cell) {
    const { math, scope } = run;
    const uNode = st.node!.value!.args![1];
    // Kept: propagation re-evaluates it with the same compiled form (run.ts, chain).
    const value = compiledOnce(st, () => st.node!.value!.args![0], true).evaluate(scope);
    const u = uNode.compile().evaluate(scope);
    const v = siOf(math, value);
    const us = siOf(math, u);
    if (v === null) throw new Error('the value before ± must be a single number or quantity');
    if (us === null) throw new Error('the standard uncertainty after ± must be a single number or quantity');
    const sameDimension =
      typeof value === 'number' ? typeof u === 'number' : math.isUnit(u) && (u as Unit).equalBase(value as Unit);
    if (!sameDimension) throw new Error('the standard uncertainty after ± must have the dimension of the value');
    if (!(us >= 0) || !Number.isFinite(us) || !Number.isFinite(v))
      throw new Error('the standard uncertainty must be a finite number ≥ 0');
    run.define(st.defines!, value, cell);
    run.defineUncertainty(st.defines!, u, cell);
    return value;
  },
};
