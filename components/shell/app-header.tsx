import Link from 'next/link';
import { SignOutButton } from '@/components/auth/sign-out-button';
import type { NavigationCounts } from '@/lib/home/my-work';
import { BrandMark } from './brand-mark';
import { HeaderMenu } from './header-menu';
import { NavLink } from './nav-link';

const NAV = [
  { href: '/projects', label: 'Projects', signedOut: false },
  { href: '/checks', label: 'My checks', signedOut: false },
  { href: '/approvals', label: 'My approvals', signedOut: false },
  { href: '/register', label: 'Register', signedOut: false },
  // Anyone holding a copy can check it without an account: the one page a visitor can use.
  { href: '/verify', label: 'Verify', signedOut: true },
] as const;

/** Which count each link shows (signed in): the queue behind it. */
const COUNT_OF: Partial<Record<string, keyof NavigationCounts>> = {
  '/checks': 'checks',
  '/approvals': 'approvals',
  '/register': 'issue',
};

/** A count beside a link's label; its words are read out, the figure is what the eye sees. */
function CountBadge({ n, what }: { n: number; what: string }) {
  if (n <= 0) return null;
  return (
    <span className="ml-1.5 inline-block min-w-[1.25rem] rounded-full bg-accent px-1.5 text-center text-xs font-bold leading-5 text-white">
      {n}
      <span className="sr-only"> {what}</span>
    </span>
  );
}

export function AppHeader({
  userName,
  isAdmin = false,
  counts = null,
}: {
  userName: string | null;
  isAdmin?: boolean;
  counts?: NavigationCounts | null;
}) {
  return (
    <header className="border-b border-rule bg-surface">
      <div className="mx-auto flex max-w-sheet flex-wrap items-center gap-x-6 gap-y-2 px-gutter py-3 md:flex-nowrap">
        <Link href="/" className="flex items-center gap-2 text-ink no-underline" aria-label="Worldsheet, home">
          <BrandMark className="h-7 w-7 text-accent" />
          <span className="text-lg font-bold tracking-tight">Worldsheet</span>
        </Link>
        <HeaderMenu waiting={counts?.work ?? 0} fold={userName !== null}>
          <nav aria-label="Main" className="flex flex-wrap items-center gap-1">
            {userName ? (
              <NavLink href="/" exact>
                My work
                <CountBadge n={counts?.work ?? 0} what="waiting for you" />
              </NavLink>
            ) : null}
            {NAV.filter((item) => userName || item.signedOut).map((item) => {
              const count = COUNT_OF[item.href];
              return (
                <NavLink key={item.href} href={item.href}>
                  {item.label}
                  {count && counts ? (
                    <CountBadge
                      n={counts[count]}
                      what={count === 'issue' ? 'approved, waiting for issue' : 'waiting'}
                    />
                  ) : null}
                </NavLink>
              );
            })}
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
        </HeaderMenu>
      </div>
    </header>
  );
}
