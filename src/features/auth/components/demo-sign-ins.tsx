import { Link } from 'react-router-dom';
import { DEMO_PASSWORD, DEMO_STUDIO, DEMO_USERS } from '../../../../shared/demo';
import { ROLE_LABELS } from '../../../../shared/schemas/roles';

/** The fictional demo accounts of a local install, each with a button that fills the sign-in form. */
export function DemoSignIns({ onPick }: { onPick: (email: string, password: string) => void }) {
  return (
    <aside
      aria-label="Demo sign-ins"
      className="rounded border border-ink-200 bg-white p-3 text-xs text-ink-600"
    >
      <p className="mb-2">
        Local demo of <span className="font-medium text-ink-800">{DEMO_STUDIO.name}</span> (fictional). Every
        demo account uses the password <code className="font-mono text-ink-900">{DEMO_PASSWORD}</code>.
      </p>
      <ul className="flex flex-col gap-1">
        {DEMO_USERS.map((user) => (
          <li key={user.email} className="flex items-center justify-between gap-2">
            <span className="min-w-0">
              <span className="font-mono text-ink-900">{user.email}</span>{' '}
              <span className="text-ink-400">{user.roles.map((role) => ROLE_LABELS[role]).join(', ')}</span>
            </span>
            <button
              type="button"
              className="shrink-0 rounded border border-ink-200 px-1.5 py-0.5 text-ink-800 hover:bg-ink-100"
              onClick={() => onPick(user.email, DEMO_PASSWORD)}
              aria-label={`Use ${user.email}`}
            >
              Use
            </button>
          </li>
        ))}
      </ul>
      <p className="mt-2">
        Mail sent by this install is captured in the{' '}
        <Link to="/mailbox" className="text-tealdeep-600 underline">
          local mailbox
        </Link>
        .
      </p>
    </aside>
  );
}
