'use client';
// The box a table scrolls in (issue 18's UI kit): a wide table scrolls sideways inside its own box instead of
// making the page scroll. A box that scrolls must be reachable by keyboard and named (WCAG 2.2: 2.1.1
// keyboard, 4.1.2 name, role, value), so while its content overflows it becomes a focusable region named by
// the table's caption; a box that fits adds no tab stop. `label` makes it a named focusable region always.
import { useEffect, useRef, useState, type ReactNode } from 'react';

/** Whether an element's content is larger than its box, sideways or downwards (one pixel of rounding allowed). */
export function overflows(el: {
  scrollWidth: number;
  clientWidth: number;
  scrollHeight: number;
  clientHeight: number;
}) {
  return el.scrollWidth > el.clientWidth + 1 || el.scrollHeight > el.clientHeight + 1;
}

export function ScrollBox({
  labelledBy,
  scrollLabel,
  label,
  className,
  children,
}: {
  /** Id of the element naming the box while it scrolls (the table's caption). */
  labelledBy?: string;
  /** The box's name while it scrolls, where no element names it (a formula: "Line 3, typeset"). */
  scrollLabel?: string;
  /** A fixed name: the box is then a focusable region whether or not it scrolls. */
  label?: string;
  className?: string;
  children: ReactNode;
}) {
  const ref = useRef<HTMLDivElement>(null);
  const [scrolls, setScrolls] = useState(false);
  useEffect(() => {
    const el = ref.current;
    if (!el || label !== undefined) return;
    const measure = () => setScrolls(overflows(el));
    measure();
    if (typeof ResizeObserver === 'undefined') {
      window.addEventListener('resize', measure);
      return () => window.removeEventListener('resize', measure);
    }
    const observer = new ResizeObserver(measure);
    observer.observe(el);
    if (el.firstElementChild) observer.observe(el.firstElementChild);
    return () => observer.disconnect();
  }, [label]);
  const region =
    label !== undefined
      ? { tabIndex: 0, role: 'region', 'aria-label': label }
      : scrolls
        ? {
            tabIndex: 0,
            role: 'region',
            ...(labelledBy ? { 'aria-labelledby': labelledBy } : { 'aria-label': scrollLabel }),
          }
        : {};
  return (
    <div ref={ref} className={boxClasses(className)} {...region}>
      {children}
    </div>
  );
}

/**
 * `overflow-x-auto` and the caller's classes, unless those already let the box scroll both ways; always
 * `relative`, so that what is positioned inside (KaTeX's hidden MathML, for one) is clipped by the box
 * instead of widening the page.
 */
function boxClasses(className: string | undefined): string {
  if (!className) return 'relative overflow-x-auto';
  return /(^|\s)overflow-auto(\s|$)/.test(className)
    ? `relative ${className}`
    : `relative overflow-x-auto ${className}`;
}
