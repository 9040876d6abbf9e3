import type { Metadata } from 'next';
import { ConfirmEmail } from '@/components/auth/confirm-email';
import { safeCallback } from '@/lib/action-state';

export const metadata: Metadata = { title: 'Confirm your e-mail address' };

export default async function VerifyEmailPage({ searchParams }: { searchParams: Promise<{ token?: string; callbackUrl?: string }> }) {
  const { token, callbackUrl } = await searchParams;
  return (
    <>
      <h1 className="text-2xl font-bold">Confirm your e-mail address</h1>
      {token ? (
        <div className="mt-4">
          <ConfirmEmail token={token} callbackUrl={callbackUrl ? safeCallback(callbackUrl) : undefined} />
        </div>
      ) : (
        <p role="alert" className="mt-3 text-sm">
          This link is incomplete. Open the link from the e-mail again.
        </p>
      )}
    </>
  );
}
