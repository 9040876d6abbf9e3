import type { Metadata } from 'next';
import Link from 'next/link';
import { SignUpForm } from '@/components/auth/sign-up-form';
import { safeCallback } from '@/lib/action-state';

export const metadata: Metadata = { title: 'Create an account' };

export default async function SignUpPage({ searchParams }: { searchParams: Promise<{ callbackUrl?: string }> }) {
  const { callbackUrl } = await searchParams;
  const next = callbackUrl ? safeCallback(callbackUrl) : undefined;
  return (
    <>
      <h1 className="text-2xl font-bold">Create an account</h1>
      <p className="mt-1 mb-6 text-sm text-muted">
        Already have one?{' '}
        <Link href={`/sign-in${next ? `?callbackUrl=${encodeURIComponent(next)}` : ''}`} className="text-brand underline">
          Sign in
        </Link>
      </p>
      <SignUpForm callbackUrl={next} />
    </>
  );
}
