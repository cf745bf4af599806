// The mark on work carried over from the returned check of an earlier version (see carry-over.ts):
// pure, so that client components read it too.

const CARRIED_FIELDS = ['verificationMethod', 'checkerNotes', 'alternateCells', 'tolerance'] as const;
export type CarriedField = (typeof CARRIED_FIELDS)[number];
const CARRIED_FIELD_LABELS: Record<CarriedField, string> = {
  verificationMethod: 'verification method',
  checkerNotes: "checker's notes",
  alternateCells: 'alternate calculation',
  tolerance: 'tolerance',
};

export interface CarriedOver {
  fromCheckId: string;
  fromVersion: number;
  /** The fields still as carried over (an edit by the checker removes the field). */
  fields: CarriedField[];
  /** When the checker confirmed the fields still carried over, and who; null until then. */
  confirmedAt: string | null;
  confirmedBy: string | null;
}

export function readCarriedOver(value: unknown): CarriedOver | null {
  if (!value || typeof value !== 'object') return null;
  const v = value as Partial<CarriedOver>;
  if (typeof v.fromCheckId !== 'string' || typeof v.fromVersion !== 'number' || !Array.isArray(v.fields)) return null;
  return {
    fromCheckId: v.fromCheckId,
    fromVersion: v.fromVersion,
    fields: v.fields.filter((f): f is CarriedField => (CARRIED_FIELDS as readonly string[]).includes(f)),
    confirmedAt: v.confirmedAt ?? null,
    confirmedBy: v.confirmedBy ?? null,
  };
}

/** Carried-over fields the checker has neither edited nor confirmed: signing waits for them. */
export const unconfirmedCarriedOver = (c: CarriedOver | null): CarriedField[] => (c && !c.confirmedAt ? c.fields : []);

/** "verification method, checker's notes and alternate calculation" */
export function carriedFieldsText(fields: readonly CarriedField[]): string {
  const names = fields.map((f) => CARRIED_FIELD_LABELS[f]);
  return names.length <= 1 ? (names[0] ?? '') : `${names.slice(0, -1).join(', ')} and ${names.at(-1)}`;
}
