import Link from 'next/link';

export function Logo({ href = '/' }: { href?: string }) {
  return (
    <Link href={href} className="inline-flex items-center gap-2 font-bold text-ink no-underline">
      <svg width="28" height="28" viewBox="0 0 28 28" aria-hidden="true">
        <rect x="1" y="1" width="26" height="26" rx="6" fill="#1f5f8b" />
        <circle cx="9" cy="10" r="3" fill="#fff" />
        <circle cx="19" cy="10" r="3" fill="#fff" />
        <rect x="5" y="17" width="18" height="5" rx="2.5" fill="#fff" />
      </svg>
      <span className="text-lg tracking-tight">Unitwise</span>
    </Link>
  );
}
