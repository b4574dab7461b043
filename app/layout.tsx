import type { Metadata } from 'next';
import { connection } from 'next/server';
import localFont from 'next/font/local';
import './globals.css';
import { HydrationMark } from '@/components/hydration-mark';

// Fonts ship with the app (IBM Plex, from @fontsource); nothing is fetched at build or run time.
const sans = localFont({
  src: [
    { path: './fonts/ibm-plex-sans-latin-400-normal.woff2', weight: '400' },
    { path: './fonts/ibm-plex-sans-latin-500-normal.woff2', weight: '500' },
    { path: './fonts/ibm-plex-sans-latin-600-normal.woff2', weight: '600' },
  ],
  variable: '--font-sans',
  display: 'swap',
});
const mono = localFont({
  src: './fonts/ibm-plex-mono-latin-400-normal.woff2',
  variable: '--font-mono',
  display: 'swap',
});

export const metadata: Metadata = {
  title: { default: 'Lagwise', template: '%s · Lagwise' },
  description:
    'Insulation thickness, surface safety review and bill of quantities for industrial pipework and vessels.',
};

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  // Every page renders per request so Next.js can put this request's CSP nonce (proxy.ts) on its scripts.
  await connection();
  return (
    <html lang="en" className={`${sans.variable} ${mono.variable}`}>
      <body className="min-h-screen font-sans">
        {children}
        <HydrationMark />
      </body>
    </html>
  );
}
