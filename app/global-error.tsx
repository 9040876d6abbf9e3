'use client';

import './globals.css';

/**
 * Shown when the root layout itself fails, in place of the whole document (so it has its own
 * <html> and <body>). Everything below the root layout has app/error.tsx.
 */
export default function GlobalError({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <html lang="en">
      <body className="font-sans antialiased">
        <main id="main" className="mx-auto max-w-xl px-4 py-16">
          <div role="alert" className="rounded-lg border border-line bg-white p-6">
            <h1 className="text-xl font-bold">Unitwise could not show this page</h1>
            <p className="mt-2 text-sm">Something went wrong on our side. The error was logged. Nothing you saved is lost.</p>
            <button type="button" onClick={reset} className="mt-4 rounded-md bg-brand px-4 py-2 text-sm font-semibold text-white">
              Try again
            </button>
          </div>
        </main>
      </body>
    </html>
  );
}
