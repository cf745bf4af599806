import { smallPrimaryButton } from '@/components/ui/button';

/**
 * Choose any two versions of a sheet to compare: a plain GET form (works without JavaScript) to the
 * compare page, with two labelled selects. `idPrefix` keeps the ids unique when a page shows it twice.
 */
export function VersionPicker({
  action,
  versions,
  base,
  target,
  idPrefix = 'compare',
  compact = false,
}: {
  action: string;
  versions: ReadonlyArray<{ number: number; message: string }>;
  base: number | null;
  target: number | null;
  idPrefix?: string;
  compact?: boolean;
}) {
  const newestFirst = [...versions].sort((a, b) => b.number - a.number);
  const label = (v: { number: number; message: string }) =>
    `Version ${v.number}${v.message ? ` — ${v.message.length > 40 ? `${v.message.slice(0, 39)}…` : v.message}` : ''}`;
  const select = 'rounded border border-rule-strong bg-surface px-2 py-1 text-sm text-ink max-w-full';
  return (
    <form
      method="get"
      action={action}
      aria-label="Compare two versions"
      className={`flex flex-wrap items-end gap-3 ${compact ? 'text-sm' : ''}`}
    >
      <div className="flex min-w-0 flex-col gap-1">
        <label htmlFor={`${idPrefix}-base`} className="text-sm font-semibold">
          Base version
        </label>
        <select id={`${idPrefix}-base`} name="base" defaultValue={base === null ? '' : String(base)} className={select}>
          <option value="">None: everything in the target is new</option>
          {newestFirst.map((v) => (
            <option key={v.number} value={v.number}>
              {label(v)}
            </option>
          ))}
        </select>
      </div>
      <div className="flex min-w-0 flex-col gap-1">
        <label htmlFor={`${idPrefix}-target`} className="text-sm font-semibold">
          Target version
        </label>
        <select
          id={`${idPrefix}-target`}
          name="target"
          defaultValue={target === null ? '' : String(target)}
          className={select}
        >
          {newestFirst.map((v) => (
            <option key={v.number} value={v.number}>
              {label(v)}
            </option>
          ))}
        </select>
      </div>
      <button type="submit" className={`${smallPrimaryButton} text-sm`}>
        Compare
      </button>
    </form>
  );
}
