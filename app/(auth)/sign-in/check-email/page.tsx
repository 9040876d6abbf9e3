import type { Metadata } from 'next';
import { BackToSignIn } from '@/components/auth/back-to-sign-in';

export const metadata: Metadata = { title: 'Check your inbox' };

export default function CheckEmailPage() {
  return (
    <>
      <h1 className="text-2xl font-bold">Check your inbox</h1>
      <p className="mt-3 text-sm">
        We have sent a sign-in link. It works once and expires in 15 minutes. You can close this tab; the link opens Unitwise
        signed in.
      </p>
      <BackToSignIn />
    </>
  );
}
