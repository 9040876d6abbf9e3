import type { Metadata, Viewport } from 'next';
import localFont from 'next/font/local';
import type { ReactNode } from 'react';
import { Providers } from '@/components/providers';
import './globals.css';

// Inter ships inside the app from the @fontsource-variable/inter package; nothing is fetched at build or run time.
const inter = localFont({
  src: '../node_modules/@fontsource-variable/inter/files/inter-latin-wght-normal.woff2',
  variable: '--font-inter',
  weight: '100 900',
  display: 'swap',
});

export const metadata: Metadata = {
  title: { default: 'Unitwise', template: '%s · Unitwise' },
  description: 'Plan studies analysed with linear models: the design, its dependence, the sample size and how the analysis holds up.',
};

export const viewport: Viewport = { width: 'device-width', initialScale: 1 };

// Every page is rendered per request: the Content-Security-Policy (proxy.ts) allows only scripts
// carrying that answer's nonce, and a page rendered at build time would carry none.
export const dynamic = 'force-dynamic';

export default function RootLayout({ children }: { children: ReactNode }) {
  return (
    <html lang="en" className={inter.variable}>
      <body className="font-sans antialiased">
        <a href="#main" className="skip-link">
          Skip to content
        </a>
        <Providers>{children}</Providers>
      </body>
    </html>
  );
}
