import Link from 'next/link';

export function BackToSignIn() {
  return (
    <p className="mt-4 text-sm">
      <Link href="/sign-in" className="text-brand underline">
        Back to sign-in
      </Link>
    </p>
  );
}
