'use client';
// The header's navigation and account links: in line on a laptop; on a phone, folded behind one
// "Menu" button so that the header takes one line (issue 21). The button says whether the menu is
// open (aria-expanded), Escape closes it and gives the focus back to the button, and following a
// link closes it.
import { usePathname } from 'next/navigation';
import { useEffect, useId, useRef, useState, type ReactNode } from 'react';

export function HeaderMenu({
  waiting = 0,
  fold = true,
  children,
}: {
  /** Items waiting for the person, shown on the button. */
  waiting?: number;
  /** Whether there is enough to fold on a phone (a visitor's two links are shown as they are). */
  fold?: boolean;
  children: ReactNode;
}) {
  const [open, setOpen] = useState(false);
  const pathname = usePathname();
  const id = useId();
  const button = useRef<HTMLButtonElement>(null);
  useEffect(() => setOpen(false), [pathname]);
  if (!fold) return <div className="flex flex-1 flex-wrap items-center gap-x-6 gap-y-2">{children}</div>;
  return (
    <>
      <button
        ref={button}
        type="button"
        className="ml-auto inline-flex items-center gap-1.5 rounded border border-rule px-3 py-1.5 text-sm font-semibold text-ink hover:bg-paper md:hidden"
        aria-expanded={open}
        aria-controls={id}
        onClick={() => setOpen((o) => !o)}
      >
        <svg
          aria-hidden="true"
          viewBox="0 0 16 16"
          className="h-4 w-4"
          fill="none"
          stroke="currentColor"
          strokeWidth="1.6"
        >
          {open ? <path d="M3.5 3.5l9 9M12.5 3.5l-9 9" /> : <path d="M2 4h12M2 8h12M2 12h12" />}
        </svg>
        Menu
        {waiting > 0 ? (
          <span className="inline-block min-w-[1.25rem] rounded-full bg-accent px-1.5 text-center text-xs font-bold leading-5 text-white">
            {waiting}
            <span className="sr-only"> waiting for you</span>
          </span>
        ) : null}
      </button>
      <div
        id={id}
        className={`${open ? 'flex' : 'hidden'} w-full flex-col gap-2 md:flex md:w-auto md:flex-1 md:flex-row md:flex-wrap md:items-center md:gap-x-6`}
        onKeyDown={(event) => {
          if (event.key === 'Escape' && open) {
            setOpen(false);
            button.current?.focus();
          }
        }}
      >
        {children}
      </div>
    </>
  );
}
