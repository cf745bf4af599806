// A design criterion: `B_dip <= 1.8 T`, `a < x <= b`. Compared exactly on the SI values (no relative
// tolerance), both sides of one dimension; the margin to the limit is given as a fraction of it.
import type { MathJsInstance, Unit } from 'mathjs';
import { formatNumberText } from '../../format';
import { describeOperand } from '../../messages';
import type { CriterionResult } from '../../types';
import type { AnyNode, StatementForm } from '../statement';

const RELATIONAL_FNS: Record<string, (a: number, b: number) => boolean> = {
  smaller: (a, b) => a < b,
  larger: (a, b) => a > b,
  smallerEq: (a, b) => a <= b,
  largerEq: (a, b) => a >= b,
  equal: (a, b) => a === b,
  unequal: (a, b) => a !== b,
};

function isCriterion(node: AnyNode): boolean {
  if (node.type === 'RelationalNode') return true;
  return (
    node.type === 'OperatorNode' &&
    typeof node.fn === 'string' &&
    node.fn in RELATIONAL_FNS &&
    (node.args?.length ?? 0) === 2
  );
}

function criterionOperands(node: AnyNode): { operands: AnyNode[]; fns: string[] } {
  if (node.type === 'RelationalNode') return { operands: node.params as AnyNode[], fns: node.conditionals! };
  return { operands: node.args!, fns: [node.fn as string] };
}

function siNumber(math: MathJsInstance, value: unknown, side: string): { si: number; unit: Unit | null } {
  if (typeof value === 'number') return { si: value, unit: null };
  if (math.isUnit(value)) {
    const u = value as Unit;
    if (u.value === null) throw new Error(`the ${side} of the criterion is a bare unit`);
    return { si: u.value as number, unit: u };
  }
  throw new Error(`the ${side} of a criterion must be a number or a quantity`);
}

export const criterion: StatementForm = {
  name: 'design criterion',
  yieldsValue: false,
  shown: true,
  locatesErrors: true,
  recognise(st, node) {
    if (st.kind !== 'expression' || !isCriterion(node)) return false;
    st.kind = 'criterion';
    return true;
  },
  messageNode: (st) => st.node!,
  evaluate(st, run, _cell, result) {
    const { math, scope } = run;
    const { operands, fns } = criterionOperands(st.node!);
    const values = operands.map((o) => o.compile().evaluate(scope));
    let pass = true;
    let margin: number | null = null;
    for (let i = 0; i < fns.length; i++) {
      const a = siNumber(math, values[i], i === 0 ? 'left side' : 'middle');
      const b = siNumber(math, values[i + 1], 'right side');
      if ((a.unit === null) !== (b.unit === null) || (a.unit && b.unit && !a.unit.equalBase(b.unit))) {
        const sig = 6;
        throw new Error(
          `the two sides of the criterion have different dimensions: ${describeOperand(math, operands[i], values[i], sig)} and ${describeOperand(math, operands[i + 1], values[i + 1], sig)}; compare quantities of one kind`,
        );
      }
      const holds = RELATIONAL_FNS[fns[i]](a.si, b.si);
      pass &&= holds;
      // Relative margin to the limit: how far the left side is from the right, as a fraction of it.
      if (fns[i] !== 'equal' && fns[i] !== 'unequal' && b.si !== 0) {
        const towardsPass = fns[i] === 'smaller' || fns[i] === 'smallerEq' ? b.si - a.si : a.si - b.si;
        const m = towardsPass / Math.abs(b.si);
        margin = margin === null ? m : Math.min(margin, m);
      }
    }
    const marginText =
      margin === null
        ? 'compared exactly (no tolerance)'
        : `margin ${formatNumberText(margin * 100, 3)} % of the limit, compared exactly (no tolerance)`;
    const c: CriterionResult = { pass, comparison: 'exact', margin, marginText };
    result.criterion = c;
    return pass;
  },
};
