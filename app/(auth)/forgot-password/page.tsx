import type { Metadata } from 'next';
import { BackToSignIn } from '@/components/auth/back-to-sign-in';
import { ForgotPasswordForm } from '@/components/auth/forgot-password-form';

export const metadata: Metadata = { title: 'Reset your password' };

export default function ForgotPasswordPage() {
  return (
    <>
      <h1 className="text-2xl font-bold">Reset your password</h1>
      <p className="mt-1 mb-6 text-sm text-muted">We will e-mail you a link to choose a new password.</p>
      <ForgotPasswordForm />
      <BackToSignIn />
    </>
  );
}
