import type { Metadata } from 'next';
import { BackToSignIn } from '@/components/auth/back-to-sign-in';

export const metadata: Metadata = { title: 'Sign-in problem' };

const MESSAGES: Record<string, string> = {
  Verification: 'This sign-in link has expired or was already used. Ask for a new one.',
  AccessDenied: 'Signing in with that account is not allowed.',
  Configuration: 'Sign-in is not available right now. Try again in a moment.',
};

export default async function SignInProblemPage({ searchParams }: { searchParams: Promise<{ error?: string }> }) {
  const { error } = await searchParams;
  return (
    <>
      <h1 className="text-2xl font-bold">We could not sign you in</h1>
      <p role="alert" className="mt-3 text-sm">
        {MESSAGES[error ?? ''] ?? 'Something went wrong while signing in. Try again.'}
      </p>
      <BackToSignIn />
    </>
  );
}
