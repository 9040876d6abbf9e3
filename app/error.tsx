'use client';

import { useRouter } from 'next/navigation';
import { startTransition, useCallback, useEffect, useState } from 'react';
import { Button } from '@/components/ui/button';

/**
 * Shown instead of a crash. It asks /api/health whether the database is the problem; while it is
 * down the page says so and retries every few seconds, then recovers by itself.
 */
export default function ErrorPage({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  const [dbDown, setDbDown] = useState<boolean | null>(null);
  const router = useRouter();
  // Fetch the page again from the server, then leave the error state.
  const retry = useCallback(() => {
    startTransition(() => {
      router.refresh();
      reset();
    });
  }, [router, reset]);

  useEffect(() => {
    let stopped = false;
    async function check() {
      try {
        const res = await fetch('/api/health', { cache: 'no-store' });
        if (stopped) return;
        if (res.ok) {
          if (dbDown) retry();
          setDbDown(false);
        } else {
          setDbDown(true);
        }
      } catch {
        if (!stopped) setDbDown(true);
      }
    }
    void check();
    const timer = setInterval(check, 5000);
    return () => {
      stopped = true;
      clearInterval(timer);
    };
  }, [dbDown, retry]);

  return (
    <div id="main" className="mx-auto max-w-xl px-4 py-16">
      <div role="alert" className="rounded-lg border border-line bg-white p-6">
        <h1 className="text-xl font-bold">{dbDown ? 'The database is not reachable' : 'This page could not be shown'}</h1>
        <p className="mt-2 text-sm">
          {dbDown
            ? 'Unitwise cannot reach its database right now. Nothing you saved is lost. This page retries every 5 seconds and comes back by itself.'
            : 'Something went wrong while loading this page. The error was logged. Try again.'}
        </p>
        <Button className="mt-4" onClick={retry}>
          Try again
        </Button>
      </div>
    </div>
  );
}
