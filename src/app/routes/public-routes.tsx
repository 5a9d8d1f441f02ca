// Screens reached without a session: sign-in, password reset, invitation acceptance and not-found.
import { Link, useNavigate, useParams, useSearchParams } from 'react-router-dom';
import { PublicLayout } from '../../components/layout/public-layout';
import { ErrorNotice } from '../../components/ui/status';
import { AcceptInvitationForm } from '../../features/auth/components/accept-invitation-form';
import { ForgotPasswordForm } from '../../features/auth/components/forgot-password-form';
import { ResetPasswordForm } from '../../features/auth/components/reset-password-form';
import { SignInForm } from '../../features/auth/components/sign-in-form';
import { useMailbox } from '../../features/mailbox/api/get-mailbox';
import { landingPath } from '../../lib/landing';

export function SignInRoute() {
  const navigate = useNavigate();
  const [params] = useSearchParams();
  const mailbox = useMailbox();
  return (
    <PublicLayout title="Sign in to Legwork">
      <SignInForm
        showDemo={mailbox.data?.enabled === true}
        onSignedIn={(me) => void navigate(landingPath(me, params.get('next')), { replace: true })}
      />
    </PublicLayout>
  );
}

export function ForgotPasswordRoute() {
  const mailbox = useMailbox();
  return (
    <PublicLayout title="Reset your password">
      <p className="text-sm text-ink-600">
        Enter the e-mail you sign in with. We send a link to set a new password.
      </p>
      <ForgotPasswordForm />
      <p className="flex gap-4 text-xs">
        <Link to="/sign-in" className="text-tealdeep-600 underline">
          Back to sign-in
        </Link>
        {mailbox.data?.enabled ? (
          <Link to="/mailbox" className="text-tealdeep-600 underline">
            Local mailbox
          </Link>
        ) : null}
      </p>
    </PublicLayout>
  );
}

export function ResetPasswordRoute() {
  const [params] = useSearchParams();
  const token = params.get('token');
  return (
    <PublicLayout title="Choose a new password">
      {token ? (
        <ResetPasswordForm token={token} />
      ) : (
        <ErrorNotice
          error={
            new Error('This page needs the token from the reset link in your e-mail; open the link again.')
          }
        />
      )}
      <p className="flex gap-4 text-xs">
        <Link to="/sign-in" className="text-tealdeep-600 underline">
          Back to sign-in
        </Link>
        <Link to="/forgot-password" className="text-tealdeep-600 underline">
          Request a new link
        </Link>
      </p>
    </PublicLayout>
  );
}

export function AcceptInvitationRoute() {
  const { token = '' } = useParams();
  const navigate = useNavigate();
  return (
    <PublicLayout title="Join a studio on Legwork">
      <AcceptInvitationForm
        token={token}
        onAccepted={(me, studioName) => {
          const joined = me.memberships.find((membership) => membership.studioName === studioName);
          void navigate(joined ? `/s/${joined.studioId}` : landingPath(me, null), { replace: true });
        }}
      />
    </PublicLayout>
  );
}

export function NotFoundRoute() {
  return (
    <PublicLayout title="Page not found">
      <p className="text-sm text-ink-600">
        Nothing lives at this address. It may have moved, or the link was mistyped.
      </p>
      <Link to="/" className="text-sm text-tealdeep-600 underline">
        Go to your studio
      </Link>
    </PublicLayout>
  );
}
