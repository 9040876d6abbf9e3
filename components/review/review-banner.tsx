import Link from 'next/link';
import type { ReviewStateDto } from '@/lib/api/versions';
import { formatDateTime } from '@/lib/format';

/**
 * "Changed since sign-off": shown in the study's header (on every tab) while the newest
 * sign-off that stands covers an older revision than the newest, with a link to the comparison.
 */
export function ChangedSinceSignoff({ studyId, review }: { studyId: string; review: ReviewStateDto }) {
  const s = review.signoff;
  if (!s || !review.changedSinceSignoff) return null;
  const name = s.versionName ? `“${s.versionName}”` : `version ${s.version}`;
  return (
    <div role="note" aria-label="Changed since sign-off" className="rounded-md border-l-4 border-caution bg-caution-light px-4 py-3 text-sm text-caution">
      <span className="font-semibold">Changed since sign-off.</span> {s.signerName ?? 'A consultant'} signed off {name} on {formatDateTime(s.createdAt)}; the design has changed since.{' '}
      {review.latestVersion !== null && (
        <Link className="font-semibold underline" href={`/studies/${studyId}/review/compare?from=${s.version}&to=${review.latestVersion}`}>
          See what changed
        </Link>
      )}
    </div>
  );
}

export const STATUS_WORDS: Record<ReviewStateDto['status'], string> = { draft: 'Draft', 'in-review': 'In review', 'signed-off': 'Signed off', archived: 'Archived' };
