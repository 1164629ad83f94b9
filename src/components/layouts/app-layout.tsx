import clsx from "clsx";
import type { ReactNode } from "react";
import { NavLink } from "react-router";
import { Wordmark } from "@/components/ui/wordmark";

export type NavItem = { to: string; label: string; end?: boolean; note?: string };

type Props = {
  nav: NavItem[];
  switcher: ReactNode;
  /** The workshop search box, under the switcher. */
  search?: ReactNode;
  account: ReactNode;
  children: ReactNode;
};

/**
 * The signed-in frame: a rail on wide screens (tablet landscape and up), a top bar with the same
 * links on narrow ones. A skip link jumps past the navigation for keyboard users.
 */
export function AppLayout({ nav, switcher, search, account, children }: Props) {
  return (
    <div className="app-shell min-h-dvh bg-canvas md:grid md:grid-cols-[var(--spacing-rail)_1fr]">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-10 focus:rounded-control focus:bg-surface focus:px-4 focus:py-2">
        Skip to content
      </a>
      {/* The column carries the colour and the border, so they run the full height of a long page. */}
      <div className="app-rail border-b border-line bg-surface md:border-b-0 md:border-r">
      <aside className="md:sticky md:top-0 md:flex md:h-dvh md:flex-col">
        <div className="flex items-center justify-between gap-4 px-gutter pt-4 md:block">
          <Wordmark />
        </div>
        <div className="px-gutter pt-4">{switcher}</div>
        {search ? <div className="no-print px-gutter pt-3">{search}</div> : null}
        <nav aria-label="Main" className="px-3 py-3 md:flex-1 md:overflow-y-auto">
          <ul className="flex flex-wrap gap-1 md:flex-col">
            {nav.map((item) => (
              <li key={item.to}>
                <NavLink
                  to={item.to}
                  end={item.end}
                  className={({ isActive }) =>
                    clsx(
                      "flex min-h-touch items-center justify-between gap-2 rounded-control px-3 font-medium",
                      isActive ? "bg-steel-600 text-white" : "text-ink hover:bg-steel-50",
                    )
                  }
                >
                  {({ isActive }) => (
                    <>
                      <span>{item.label}</span>
                      {item.note ? (
                        <span className={clsx("hidden text-caption font-normal md:inline", isActive ? "text-steel-100" : "text-ink-faint")}>{item.note}</span>
                      ) : null}
                    </>
                  )}
                </NavLink>
              </li>
            ))}
          </ul>
        </nav>
        <div className="border-t border-line px-gutter py-4">{account}</div>
      </aside>
      </div>
      <main id="main" tabIndex={-1} className="min-w-0 px-gutter py-6 md:py-10">
        <div className="mx-auto max-w-page">{children}</div>
      </main>
    </div>
  );
}
