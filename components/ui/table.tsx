// The table kit (issue 18's UI kit): every table has a caption (shown, or for screen readers only), header
// cells with their scope, and sits in a box that scrolls sideways on its own (components/ui/scroll-box.tsx),
// so a wide table never makes the page scroll. Pure markup besides the box: usable from server pages and
// client components alike.
import { useId, type ComponentProps, type ReactNode } from 'react';
import { ScrollBox } from './scroll-box';

/** The classes most tables of the screens share. */
export const TABLE_CLASS = 'w-full border-collapse text-sm';

export function Table({
  caption,
  captionClassName = 'sr-only',
  className = TABLE_CLASS,
  box,
  boxLabel,
  children,
}: {
  /** The table's name (WCAG 2.2 1.3.1): required. */
  caption: ReactNode;
  /** Classes of the caption; by default it is read by screen readers only. */
  captionClassName?: string;
  className?: string;
  /** Classes of the scrolling box around the table (margins, border, height limit). */
  box?: string;
  /** A fixed name making the box a focusable region even when it does not scroll. */
  boxLabel?: string;
  children?: ReactNode;
}) {
  const id = useId();
  return (
    <ScrollBox labelledBy={id} label={boxLabel} className={box}>
      <table className={className}>
        <caption id={id} className={captionClassName}>
          {caption}
        </caption>
        {children}
      </table>
    </ScrollBox>
  );
}

/** A header cell: a column header unless `scope="row"`; `numeric` right-aligns it. */
export function Th({
  scope = 'col',
  numeric = false,
  className,
  ...props
}: ComponentProps<'th'> & { scope?: 'col' | 'row' | 'colgroup' | 'rowgroup'; numeric?: boolean }) {
  return <th scope={scope} className={joinClasses(className, numeric)} {...props} />;
}

/** A data cell; `numeric` right-aligns it with figures of equal width, so digits line up. */
export function Td({ numeric = false, className, ...props }: ComponentProps<'td'> & { numeric?: boolean }) {
  return <td className={joinClasses(className, numeric)} {...props} />;
}

function joinClasses(className: string | undefined, numeric: boolean): string | undefined {
  const classes = [className, numeric ? 'text-right tabular-nums' : undefined].filter(Boolean).join(' ');
  return classes || undefined;
}
