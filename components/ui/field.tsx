// A labelled form field (issue 18's UI kit): the label bound to its control by id, the hint and the error
// joined to the control with aria-describedby, and the error announced when it appears (WCAG 2.2: 1.3.1,
// 3.3.1 error identification, 3.3.2 labels or instructions, 4.1.3 status messages). The control itself stays
// the caller's (input, select, textarea): it receives the props that bind it. Pure: usable from server pages
// and client components alike.
import { useId, type ReactNode } from 'react';

/** The classes of a full-width text input or select of the forms. */
export const inputClass = 'w-full rounded border border-rule-strong bg-surface px-3 py-2';

/** What the field hands its control: spread it onto the input, select or textarea. */
export interface FieldControl {
  id: string;
  'aria-describedby'?: string;
  'aria-invalid'?: true;
}

/** The ids of a field's hint and error as its control refers to them, or undefined when it has neither. */
export function describedBy(...ids: Array<string | false | null | undefined>): string | undefined {
  const joined = ids.filter(Boolean).join(' ');
  return joined || undefined;
}

export function Field({
  label,
  id: givenId,
  hint,
  error,
  describedBy: alsoDescribedBy,
  className,
  labelClassName = 'block text-sm font-semibold',
  hintClassName = 'text-xs text-ink-muted',
  children,
}: {
  label: ReactNode;
  /** The control's id; a fresh one when not given. */
  id?: string;
  /** A line under the control saying what to enter. */
  hint?: ReactNode;
  /** What is wrong with the value: shown under the control, announced, and the control marked invalid. */
  error?: ReactNode;
  /** Ids of other elements describing the control (beside the field's hint and error). */
  describedBy?: string;
  /** Classes of the field's box. */
  className?: string;
  labelClassName?: string;
  hintClassName?: string;
  children: (control: FieldControl) => ReactNode;
}) {
  const fresh = useId();
  const id = givenId ?? fresh;
  const hintId = hint ? `${id}-hint` : undefined;
  const errorId = error ? `${id}-error` : undefined;
  const control: FieldControl = { id };
  const described = describedBy(hintId, errorId, alsoDescribedBy);
  if (described) control['aria-describedby'] = described;
  if (error) control['aria-invalid'] = true;
  return (
    <div className={className}>
      <label htmlFor={id} className={labelClassName}>
        {label}
      </label>
      {children(control)}
      {hint ? (
        <p id={hintId} className={hintClassName}>
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={errorId} role="alert" className="text-sm text-fail">
          {error}
        </p>
      ) : null}
    </div>
  );
}

/** The account password asked for to sign in or to sign a record: a required field the browser fills. */
export function PasswordField({ label, id }: { label: ReactNode; id: string }) {
  return (
    <Field label={label} id={id}>
      {(control) => (
        <input
          {...control}
          name="password"
          type="password"
          required
          autoComplete="current-password"
          className={inputClass}
        />
      )}
    </Field>
  );
}
