import type { ReactNode } from 'react';
import { NavLink } from 'react-router-dom';
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

/** The frame of every signed-in screen: top bar, left navigation, content and the caution strip. */
export function AppShell({ switcher, account, nav, children }: AppShellProps) {
  return (
    <div className="flex min-h-screen flex-col">
      <header className="flex items-center gap-4 border-b border-ink-800 bg-ink-900 px-4 py-2 text-ink-100">
        <span className="font-mono text-base font-semibold tracking-tight text-white">Legwork</span>
        <div className="min-w-0 flex-1">{switcher}</div>
        {account}
      </header>
      <div className="flex flex-1">
        <nav aria-label="Studio pages" className="w-48 shrink-0 border-r border-ink-200 bg-white px-2 py-3">
          <ul className="flex flex-col gap-0.5">
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
        <main className="flex min-w-0 flex-1 flex-col gap-4 p-5">{children}</main>
      </div>
      <CautionStrip />
    </div>
  );
}
