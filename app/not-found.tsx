import Link from 'next/link';

export default function NotFound() {
  return (
    <main id="main" className="mx-auto max-w-xl px-4 py-16">
      <h1 className="text-2xl font-bold">Not found</h1>
      <p className="mt-2 text-sm">This page does not exist, or you do not have access to it.</p>
      <p className="mt-4">
        <Link href="/studies" className="text-brand underline">
          Go to your studies
        </Link>
      </p>
    </main>
  );
}
