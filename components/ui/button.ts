// The buttons' looks (issue 18's UI kit): the class strings of a form's main action (primary, and its smaller
// form inside panels and filter bars) and of its other actions (secondary), so their colours, spacing and
// disabled state are chosen in one place. Pure: usable from client components.

/** Classes of a primary button (accent background, surface text; faded while disabled). */
export const primaryButton =
  'rounded bg-accent px-4 py-2 font-semibold text-surface hover:bg-accent-hover disabled:opacity-60';

/** The primary button's smaller form, for the main action of a panel, a thread or a filter bar. */
export const smallPrimaryButton =
  'rounded bg-accent px-3 py-1.5 font-semibold text-surface hover:bg-accent-hover disabled:opacity-60';

/** Classes of a secondary button (outlined on the surface): a form's other actions, such as cancel. */
export const secondaryButton = 'rounded border border-rule-strong bg-surface px-3 py-1.5 text-sm font-semibold';
