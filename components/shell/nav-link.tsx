'use client';

import Link from 'next/link';
import { usePathname } from 'next/navigation';

export function NavLink({
  href,
  exact = false,
  children,
}: {
  href: string;
  exact?: boolean;
  children: React.ReactNode;
}) {
  const pathname = usePathname();
  const active = pathname === href || (!exact && pathname.startsWith(`${href}/`));
  return (
    <Link
      href={href}
      aria-current={active ? 'page' : undefined}
      className={`rounded px-3 py-2 text-sm font-semibold no-underline transition-colors ${
        active ? 'bg-accent-soft text-accent-hover' : 'text-ink-muted hover:bg-paper hover:text-ink'
      }`}
    >
      {children}
    </Link>
  );
}
