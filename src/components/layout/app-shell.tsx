import type { ReactNode, RefObject } from 'react';
import { useEffect, useRef } from 'react';
import { NavLink, useLocation } from 'react-router-dom';
import { CautionStrip } from './caution-strip';

export interface NavItem {
  to: string;
  label: string;
  end?: boolean;
}

export interface AppShellProps {
  /** The studio switcher, rendered in the top bar. */
  switcher: ReactNode;
  /** The signed-in user's name and sign-out, rendered at the right of the top bar. */
  account: ReactNode;
  nav: readonly NavItem[];
  children: ReactNode;
}

/**
 * After a navigation inside the app (not on the first load), moves the keyboard focus to the new
 * page's heading, or to the page itself until the heading is there, so a screen reader announces
 * where the person is and Tab starts from the page rather than from the link they used.
 */
function useFocusOnNavigate(pageRef: RefObject<HTMLElement | null>) {
  const { pathname } = useLocation();
  const first = useRef(true);
  useEffect(() => {
    if (first.current) {
      first.current = false;
      return;
    }
    const page = pageRef.current;
    if (!page) return;
    let tries = 0;
    let frame = 0;
    // The link or button that navigated; once the person has moved on elsewhere, leave the focus be.
    const from = document.activeElement;
    const focusHeading = () => {
      const now = document.activeElement;
      if (now !== from && now !== page && now !== document.body && now !== null) return;
      const heading = page.querySelector<HTMLElement>('h1');
      if (heading) {
        if (!heading.hasAttribute('tabindex')) heading.setAttribute('tabindex', '-1');
        heading.focus();
        return;
      }
      if (tries === 0) page.focus();
      // The heading may wait for the page's data; look again for a second or so.
      if (++tries < 60) frame = requestAnimationFrame(focusHeading);
    };
    frame = requestAnimationFrame(focusHeading);
    return () => cancelAnimationFrame(frame);
  }, [pathname, pageRef]);
}

/** The frame of every signed-in screen: top bar, left navigation, content and the caution strip. */
export function AppShell({ switcher, account, nav, children }: AppShellProps) {
  const pageRef = useRef<HTMLElement>(null);
  useFocusOnNavigate(pageRef);
  return (
    <div className="flex min-h-screen flex-col">
      <a
        href="#page"
        className="sr-only rounded bg-white px-3 py-2 text-sm font-medium text-tealdeep-700 focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:outline focus:outline-2 focus:outline-tealdeep-600"
      >
        Skip to the page
      </a>
      <header className="flex items-center gap-4 border-b border-ink-800 bg-ink-900 px-4 py-2 text-ink-100">
        <span className="font-mono text-base font-semibold tracking-tight text-white">Legwork</span>
        <div className="min-w-0 flex-1">{switcher}</div>
        {account}
      </header>
      {/* Below 1024 px (a tablet held upright) the navigation runs along the top, so the page keeps the width. */}
      <div className="flex flex-1 flex-col lg:flex-row">
        <nav
          aria-label="Studio pages"
          className="shrink-0 border-b border-ink-200 bg-white px-2 py-2 lg:w-48 lg:border-r lg:border-b-0 lg:py-3"
        >
          <ul className="flex flex-row flex-wrap gap-0.5 lg:flex-col">
            {nav.map((item) => (
              <li key={item.to}>
                <NavLink
                  to={item.to}
                  end={item.end}
                  className={({ isActive }) =>
                    `block rounded px-2 py-1 text-sm ${
                      isActive ? 'bg-tealdeep-600 font-medium text-white' : 'text-ink-800 hover:bg-ink-100'
                    }`
                  }
                >
                  {item.label}
                </NavLink>
              </li>
            ))}
          </ul>
        </nav>
        <main
          id="page"
          ref={pageRef}
          tabIndex={-1}
          className="flex min-w-0 flex-1 flex-col gap-4 p-5 focus:outline-none"
        >
          {children}
        </main>
      </div>
      <CautionStrip />
    </div>
  );
}
