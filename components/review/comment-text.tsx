import type { CommentDto } from '@/lib/api/review';
import { commentParts } from '@/lib/review/mentions';

/** A comment's text with its mentions shown as names. */
export function CommentText({ comment }: { comment: CommentDto }) {
  const names = new Map(comment.mentions.map((m) => [m.id, m.name]));
  return (
    <p className="whitespace-pre-wrap text-sm">
      {commentParts(comment.body, names).map((p, i) =>
        p.kind === 'text' ? (
          <span key={i}>{p.text}</span>
        ) : (
          <span key={i} className="font-semibold text-brand-dark">
            @{p.name}
          </span>
        ),
      )}
    </p>
  );
}
