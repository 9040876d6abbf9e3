import type { VersionDto } from '@/lib/api/versions';

/** Who wrote a version, in words. */
export function versionAuthors(v: Pick<VersionDto, 'authorName' | 'coAuthorName'>): string {
  const author = v.authorName ?? 'Someone no longer here';
  return v.coAuthorName ? `${author}, accepting a suggestion by ${v.coAuthorName}` : author;
}

/** A version in words: "Version 4, “Sent to the funder”". */
export function versionTitle(v: Pick<VersionDto, 'number' | 'name'>): string {
  return v.name ? `Version ${v.number}, “${v.name}”` : `Version ${v.number}`;
}
