import Link from 'next/link';
import { SignOutButton } from '@/components/auth/sign-out-button';
import { BrandMark } from './brand-mark';
import { NavLink } from './nav-link';

const NAV = [
  { href: '/projects', label: 'Projects' },
  { href: '/checks', label: 'My checks' },
  { href: '/approvals', label: 'My approvals' },
  { href: '/register', label: 'Register' },
  { href: '/verify', label: 'Verify' },
] as const;

export function AppHeader({ userName, isAdmin = false }: { userName: string | null; isAdmin?: boolean }) {
  return (
    <header className="border-b border-rule bg-surface">
      <div className="mx-auto flex max-w-sheet flex-wrap items-center gap-x-6 gap-y-2 px-gutter py-3">
        <Link href="/" className="flex items-center gap-2 text-ink no-underline" aria-label="Worldsheet, home">
          <BrandMark className="h-7 w-7 text-accent" />
          <span className="text-lg font-bold tracking-tight">Worldsheet</span>
        </Link>
        <nav aria-label="Main" className="flex flex-wrap items-center gap-1">
          {NAV.map((item) => (
            <NavLink key={item.href} href={item.href}>
              {item.label}
            </NavLink>
          ))}
          {userName ? <NavLink href="/software-impact">Software impact</NavLink> : null}
          {isAdmin ? <NavLink href="/admin">Administration</NavLink> : null}
        </nav>
        <div className="ml-auto flex items-center gap-2 text-sm text-ink-muted">
          {userName ? (
            <>
              <Link href="/account" className="text-ink-muted no-underline hover:text-ink">
                Signed in as <strong className="font-semibold text-ink">{userName}</strong>
              </Link>
              <SignOutButton />
            </>
          ) : (
            <Link href="/sign-in" className="font-semibold text-accent underline hover:text-accent-hover">
              Sign in
            </Link>
          )}
        </div>
      </div>
    </header>
  );
}
