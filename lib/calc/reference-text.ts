// How a citation of another sheet's issued result is written under the statement that uses it, in
// the app and in the issued PDF alike: "from TPT2-CALC-0003 rev. B, Brho", with a badge when that
// revision is no longer current.
import type { ResolvedReference } from './types';

export interface ReferenceText {
  /** "from TPT2-CALC-0003 rev. B, Brho". */
  text: string;
  /** The cited revision's title, when known. */
  title: string | null;
  /** "superseded by rev. C", "superseded", "withdrawn"; null while current. */
  badge: string | null;
  /** Why the value could not be used, when it could not. */
  problem: string | null;
}

export function referenceText(ref: ResolvedReference): ReferenceText {
  let badge: string | null = null;
  if (ref.status === 'superseded') badge = ref.supersededBy ? `superseded by rev. ${ref.supersededBy}` : 'superseded';
  else if (ref.status === 'withdrawn') badge = 'withdrawn';
  return { text: `from ${ref.sheet} rev. ${ref.revision}, ${ref.name}`, title: ref.title, badge, problem: ref.error };
}
