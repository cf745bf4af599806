'use client';

import { useEffect, useId, useRef, useState, type KeyboardEvent, type ReactNode } from 'react';

interface MenuItem {
  label: string;
  onSelect: () => void;
  /** Shown, reachable with the arrows, but does nothing (e.g. "Move up" on the first cell). */
  disabled?: boolean;
}

interface Props {
  /** The button's accessible name, which also names its menu (e.g. "Cell 3 actions"). */
  label: string;
  /** What the button shows (its accessible name starts with the same words). */
  children: ReactNode;
  items: readonly MenuItem[];
  /** Which edge of the button the menu lines up with. */
  align?: 'start' | 'end';
  className?: string;
}

/**
 * A button that opens a small menu (the WAI-ARIA menu button pattern): Enter, Space or the down arrow
 * open it on its first item, the up arrow on its last; in the menu the arrows, Home and End move, a
 * letter goes to the next item starting with it, Enter or Space chooses, Escape closes it and puts the
 * focus back on the button, Tab closes it and goes on. A click outside closes it. The focus returns to
 * the button before an item's action runs, so an action may move it elsewhere.
 */
export function MenuButton({ label, children, items, align = 'start', className }: Props) {
  const [open, setOpen] = useState(false);
  const [active, setActive] = useState(0);
  const button = useRef<HTMLButtonElement>(null);
  const box = useRef<HTMLDivElement>(null);
  const entries = useRef<Array<HTMLButtonElement | null>>([]);
  const menuId = useId();

  useEffect(() => {
    if (open) entries.current[active]?.focus();
  }, [open, active]);

  useEffect(() => {
    if (!open) return;
    const outside = (e: MouseEvent) => {
      if (!box.current?.contains(e.target as Node)) setOpen(false);
    };
    document.addEventListener('mousedown', outside);
    return () => document.removeEventListener('mousedown', outside);
  }, [open]);

  function show(at: number) {
    setActive(at);
    setOpen(true);
  }

  function close(focusButton: boolean) {
    setOpen(false);
    if (focusButton) button.current?.focus();
  }

  function choose(item: MenuItem) {
    if (item.disabled) return;
    close(true);
    item.onSelect();
  }

  function onButtonKey(e: KeyboardEvent<HTMLButtonElement>) {
    if (e.key === 'ArrowDown' || e.key === 'ArrowUp') {
      e.preventDefault();
      show(e.key === 'ArrowDown' ? 0 : items.length - 1);
    }
  }

  function onMenuKey(e: KeyboardEvent<HTMLDivElement>) {
    const n = items.length;
    const move = (to: number) => {
      e.preventDefault();
      setActive(((to % n) + n) % n);
    };
    if (e.key === 'ArrowDown') move(active + 1);
    else if (e.key === 'ArrowUp') move(active - 1);
    else if (e.key === 'Home') move(0);
    else if (e.key === 'End') move(n - 1);
    else if (e.key === 'Escape') {
      e.preventDefault();
      close(true);
    } else if (e.key === 'Tab') close(false);
    else if (e.key.length === 1 && /\S/.test(e.key)) {
      const letter = e.key.toLowerCase();
      for (let k = 1; k <= n; k++) {
        const i = (active + k) % n;
        if (items[i].label.toLowerCase().startsWith(letter)) return move(i);
      }
    }
  }

  return (
    <div
      ref={box}
      className="relative inline-block"
      onBlur={(e) => {
        if (open && !box.current?.contains(e.relatedTarget as Node | null)) setOpen(false);
      }}
    >
      <button
        ref={button}
        type="button"
        aria-label={label}
        aria-haspopup="menu"
        aria-expanded={open}
        aria-controls={open ? menuId : undefined}
        onClick={() => (open ? close(false) : show(0))}
        onKeyDown={onButtonKey}
        className={className ?? 'rounded border border-rule-strong bg-surface px-2 py-1 text-xs font-semibold'}
      >
        {children}
      </button>
      {open ? (
        <div
          id={menuId}
          role="menu"
          aria-label={label}
          onKeyDown={onMenuKey}
          className={`absolute top-full z-20 mt-1 min-w-44 rounded border border-rule-strong bg-surface py-1 text-sm shadow-md ${align === 'end' ? 'right-0' : 'left-0'}`}
        >
          {items.map((item, i) => (
            <button
              key={item.label}
              ref={(el) => {
                entries.current[i] = el;
              }}
              type="button"
              role="menuitem"
              tabIndex={-1}
              aria-disabled={item.disabled || undefined}
              onClick={() => choose(item)}
              onMouseEnter={() => setActive(i)}
              className="block w-full px-3 py-1.5 text-left hover:bg-accent-soft focus:bg-accent-soft focus:outline-2 focus:outline-offset-[-2px] focus:outline-focus aria-disabled:text-ink-muted aria-disabled:opacity-60"
            >
              {item.label}
            </button>
          ))}
        </div>
      ) : null}
    </div>
  );
}
