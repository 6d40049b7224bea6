import Link from "next/link";
import { Wordmark } from "@/components/brand/logo";
import type { AuthContext } from "@/lib/auth/guard";
import { can, ROLE_LABELS } from "@/lib/auth/roles";
import { NavLinks } from "./nav-links";
import { NAV_ITEMS } from "./nav-items";
import { OrgSwitcher } from "./org-switcher";
import { SignOutButton } from "./sign-out-button";

export function AppShell({ auth, children }: { auth: AuthContext; children: React.ReactNode }) {
  const items = NAV_ITEMS.filter((item) => can(auth.role, item.capability)).map(
    ({ href, label }) => ({ href, label }),
  );
  return (
    <div className="flex min-h-screen flex-col">
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-panel focus:p-2"
      >
        Skip to content
      </a>
      <header className="no-print border-b border-line bg-panel">
        <div className="flex flex-wrap items-center justify-between gap-3 px-4 py-3 sm:px-6">
          <Link href="/" className="no-underline hover:no-underline" aria-label="Recurra home">
            <Wordmark />
          </Link>
          <div className="flex flex-wrap items-center gap-3">
            <OrgSwitcher
              current={auth.organisationId}
              options={auth.memberships.map((m) => ({
                organisationId: m.organisationId,
                name: m.name,
                role: ROLE_LABELS[m.role],
              }))}
            />
            <span className="text-sm text-ink-soft" data-testid="who">
              {auth.user.name} ·{" "}
              <span className="font-medium text-ink">{ROLE_LABELS[auth.role]}</span>
            </span>
            <Link href="/account" className="text-sm">
              Account
            </Link>
            <SignOutButton />
          </div>
        </div>
        <nav aria-label="Main">
          <NavLinks items={items} />
        </nav>
      </header>
      <main id="main" className="mx-auto w-full max-w-7xl flex-1 px-4 py-6 sm:px-6">
        {children}
      </main>
      <footer className="no-print border-t border-line px-6 py-3 text-xs text-ink-soft">
        Recurra · repair information is informational; manufacturer procedures, local codes and
        licensed practice come first.
      </footer>
    </div>
  );
}
