import type { Metadata } from 'next';
import Link from 'next/link';
import { SignUpForm } from '@/components/auth/sign-up-form';

export const metadata: Metadata = { title: 'Create an account' };

export default function SignUpPage() {
  return (
    <>
      <h1 className="text-2xl font-bold">Create an account</h1>
      <p className="mt-1 mb-6 text-sm text-muted">
        Already have one?{' '}
        <Link href="/sign-in" className="text-brand underline">
          Sign in
        </Link>
      </p>
      <SignUpForm />
    </>
  );
}
