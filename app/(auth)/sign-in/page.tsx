import type { Metadata } from 'next';
import Link from 'next/link';
import { redirect } from 'next/navigation';
import { SignInForm } from '@/components/auth/sign-in-form';
import { currentActor } from '@/lib/auth/session';
import { safeCallback } from '@/lib/action-state';

export const metadata: Metadata = { title: 'Sign in' };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ callbackUrl?: string }> }) {
  const { callbackUrl } = await searchParams;
  if (await currentActor()) redirect(safeCallback(callbackUrl));
  return (
    <>
      <h1 className="text-2xl font-bold">Sign in</h1>
      <p className="mt-1 mb-6 text-sm text-muted">
        New here?{' '}
        <Link href={`/sign-up${callbackUrl ? `?callbackUrl=${encodeURIComponent(callbackUrl)}` : ''}`} className="text-brand underline">
          Create an account
        </Link>
      </p>
      <SignInForm callbackUrl={safeCallback(callbackUrl)} />
    </>
  );
}
