// The primary button's look (issue 18's UI kit): the one class string of the main action of a form, so its
// colours, spacing and disabled state are chosen in one place. Pure: usable from client components.

/** Classes of a primary button (accent background, surface text; faded while disabled). */
export const primaryButton =
  'rounded bg-accent px-4 py-2 font-semibold text-surface hover:bg-accent-hover disabled:opacity-60';
