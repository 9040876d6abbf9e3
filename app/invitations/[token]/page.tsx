import type { Metadata } from 'next';
import Link from 'next/link';
import { Logo } from '@/components/logo';
import { AcceptInvitation } from '@/components/members/accept-invitation';
import { buttonClass } from '@/components/ui/button';
import { STUDY_ROLE_DESCRIPTIONS } from '@/lib/auth/permissions';
import { currentActor } from '@/lib/auth/session';
import { previewInvitation } from '@/lib/data/invitations';

export const metadata: Metadata = { title: 'Invitation' };

export default async function InvitationPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const [invitation, actor] = await Promise.all([previewInvitation(token), currentActor()]);
  const here = `/invitations/${token}`;

  let body: React.ReactNode;
  if (!invitation) {
    body = <p role="alert">This invitation link is not valid. Check that you opened the whole link from the e-mail.</p>;
  } else if (invitation.state !== 'pending') {
    body = (
      <p role="alert">
        This invitation {invitation.state === 'accepted' ? 'was already used' : `is ${invitation.state}`}. Ask{' '}
        {invitation.invitedByName ?? 'the person who invited you'} for a new one.
      </p>
    );
  } else {
    const place = invitation.studyTitle ? `the study “${invitation.studyTitle}”` : `the workspace “${invitation.workspaceName}”`;
    const role = invitation.studyRole ?? invitation.workspaceRole;
    body = (
      <div className="space-y-4">
        <p>
          {invitation.invitedByName ?? 'A colleague'} invited <strong>{invitation.email}</strong> to {place} in {invitation.workspaceName}{' '}
          as <strong>{role}</strong>.
        </p>
        {invitation.studyRole && <p className="text-sm text-muted">{STUDY_ROLE_DESCRIPTIONS[invitation.studyRole]}</p>}
        {!actor ? (
          <div className="flex flex-wrap gap-2">
            <Link href={`/sign-in?callbackUrl=${encodeURIComponent(here)}`} className={buttonClass('primary')}>
              Sign in to accept
            </Link>
            <Link href={`/sign-up?callbackUrl=${encodeURIComponent(here)}`} className={buttonClass('secondary')}>
              Create an account
            </Link>
          </div>
        ) : actor.email.toLowerCase() !== invitation.email ? (
          <p role="alert" className="text-sm">
            You are signed in as {actor.email}, but this invitation is for {invitation.email}. Sign out and sign in with that address.
          </p>
        ) : (
          <AcceptInvitation token={token} />
        )}
      </div>
    );
  }

  return (
    <div className="flex min-h-screen flex-col items-center px-4 py-10">
      <Logo />
      <main id="main" className="mt-8 w-full max-w-lg rounded-lg border border-line bg-white p-6 text-sm sm:p-8">
        <h1 className="mb-4 text-2xl font-bold">Invitation</h1>
        {body}
      </main>
    </div>
  );
}
