// `x = fromRevision("SHEET", "REV", "name")`: a named result of an issued revision of another sheet,
// resolved by the server before evaluating (the engine never reads the database). Its resolution is
// part of the cell's cache key, so a withdrawal or a new issue changes what the cell shows.
import { REFERENCE_FUNCTION, referenceKey } from '../../references';
import type { AnyNode, StatementForm } from '../statement';
import { calledName } from '../statement';

export const citation: StatementForm = {
  name: 'citation',
  yieldsValue: true,
  shown: true,
  locatesErrors: false,
  recognise(st, node) {
    if (st.kind !== 'definition' || calledName(node.value!) !== REFERENCE_FUNCTION) return false;
    const args = (node.value!.args ?? []).map((a) =>
      a.type === 'ConstantNode' ? (a as AnyNode & { value?: unknown }).value : undefined,
    );
    if (args.length !== 3 || !args.every((a) => typeof a === 'string' && (a as string).trim() !== '')) {
      st.staticError ??= 'cite an issued result with three quoted texts: fromRevision("PROJ-CALC-0003", "B", "name")';
    } else {
      const [sheet, revision, name] = (args as string[]).map((a) => a.trim());
      st.reference = { sheet: sheet.toUpperCase(), revision: revision.toUpperCase(), name };
    }
    return true;
  },
  keyParts: (st, context) =>
    st.reference ? [`ref:${JSON.stringify(context.resolved.get(referenceKey(st.reference)) ?? null)}`] : [],
  messageNode: (st) => st.node!.value!,
  evaluate(st, run, cell, result) {
    const { math } = run;
    const reference = st.reference!;
    const ref = run.resolved.get(referenceKey(reference));
    result.references = ref ? [ref] : [];
    if (!ref)
      throw new Error(
        `${reference.sheet} rev. ${reference.revision}, ${reference.name}: citations of issued revisions are resolved within the sheet's project; save the sheet in a project to use it`,
      );
    if (ref.error || !ref.value) throw new Error(ref.error ?? 'the cited result has no value');
    const value = ref.value.unit ? math.unit(ref.value.number, ref.value.unit) : ref.value.number;
    run.define(st.defines!, value, cell);
    if (ref.value.uncertainty !== null && ref.value.uncertainty > 0) {
      const u = ref.value.unit ? math.unit(ref.value.uncertainty, ref.value.unit) : ref.value.uncertainty;
      run.defineUncertainty(st.defines!, u, cell);
    }
    return value;
  },
};
