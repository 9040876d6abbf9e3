import { headers } from 'next/headers';
import Link from 'next/link';
import { PROBLEM_HEADER } from '@/lib/http/security';

export default async function NotFound() {
  // proxy.ts marks an address it could not decode (a broken %-encoding, or far too long).
  const broken = (await headers()).has(PROBLEM_HEADER);
  return (
    <main id="main" className="mx-auto max-w-xl px-4 py-16">
      <h1 className="text-2xl font-bold">{broken ? 'This address could not be read' : 'Not found'}</h1>
      <p className="mt-2 text-sm">
        {broken
          ? 'The link is broken: part of it is not a valid web address, or it is far longer than any Unitwise address. Check where it came from.'
          : 'This page does not exist, or you do not have access to it.'}
      </p>
      <p className="mt-4">
        <Link href="/studies" className="text-brand underline">
          Go to your studies
        </Link>
      </p>
    </main>
  );
}
