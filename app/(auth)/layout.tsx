import type { ReactNode } from 'react';
import { Logo } from '@/components/logo';

export default function AuthLayout({ children }: { children: ReactNode }) {
  return (
    <div className="flex min-h-screen flex-col items-center px-4 py-10">
      <Logo />
      <main id="main" className="mt-8 w-full max-w-md rounded-lg border border-line bg-white p-6 shadow-sm sm:p-8">
        {children}
      </main>
    </div>
  );
}
