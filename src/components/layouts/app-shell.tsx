import type { ReactNode } from 'react';
import { NavLink } from 'react-router-dom';
import { Brand } from './brand';

export type NavItem = { to: string; label: string; end?: boolean };
export type NavGroup = { label?: string; items: NavItem[] };

/**
 * The signed-in frame: a left rail with the product name, navigation and who is signed in; the page on the
 * right. `busy` draws a thin bar along the top while the next page loads. On paper only the page is printed.
 */
export function AppShell({
  nav,
  user,
  footer,
  busy,
  children,
}: {
  nav: NavGroup[];
  user: { name: string; role: string; workspace: string };
  footer: ReactNode;
  busy?: boolean;
  children: ReactNode;
}) {
  return (
    <div className="min-h-screen md:flex">
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:top-2 focus:left-2 focus:z-50 focus:bg-paper-raised focus:px-3 focus:py-2 print:hidden"
      >
        Skip to the page
      </a>
      {busy ? (
        <div
          className="fixed inset-x-0 top-0 z-40 h-0.5 animate-pulse bg-clay-500 print:hidden"
          aria-hidden
        />
      ) : null}
      <aside className="flex shrink-0 flex-col border-b border-ink-line bg-paper-sunk md:sticky md:top-0 md:h-screen md:w-rail md:border-r md:border-b-0 print:hidden">
        <div className="px-4 pt-4 pb-3">
          <Brand />
        </div>
        <nav aria-label="Main" className="flex-1 overflow-y-auto px-2 pb-3">
          {nav.map((group, gi) => (
            <div key={group.label ?? gi} className={gi > 0 ? 'mt-4' : ''}>
              {group.label ? (
                <p className="px-2 pb-1 text-xs font-medium tracking-wide text-ink-faint uppercase">
                  {group.label}
                </p>
              ) : null}
              <ul className="flex flex-wrap gap-0.5 md:block md:space-y-0.5">
                {group.items.map((item) => (
                  <li key={item.to}>
                    <NavLink
                      to={item.to}
                      end={item.end}
                      className={({ isActive }) =>
                        `block rounded-card border-l-[3px] px-2 py-1.5 text-base ${
                          isActive
                            ? 'border-clay-600 bg-paper-raised font-medium text-ink'
                            : 'border-transparent text-ink-soft hover:bg-paper hover:text-ink'
                        }`
                      }
                    >
                      {item.label}
                    </NavLink>
                  </li>
                ))}
              </ul>
            </div>
          ))}
        </nav>
        <div className="space-y-3 border-t border-ink-line px-4 py-3">
          <div>
            <p className="truncate font-medium text-ink">{user.name}</p>
            <p className="text-sm text-ink-soft">{user.role}</p>
            <p className="text-sm text-ink-soft">{user.workspace}</p>
          </div>
          {footer}
        </div>
      </aside>
      <main id="main" className="min-w-0 flex-1 px-gutter py-5 md:px-8 print:p-0">
        <div className="mx-auto max-w-6xl print:max-w-none">{children}</div>
      </main>
    </div>
  );
}
