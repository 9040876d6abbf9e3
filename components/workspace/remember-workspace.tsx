'use client';

import { useEffect } from 'react';

/** Remembers the workspace last opened, so /studies opens it next time. */
export function RememberWorkspace({ id }: { id: string }) {
  useEffect(() => {
    document.cookie = `uw-workspace=${id}; path=/; max-age=${60 * 60 * 24 * 365}; samesite=lax`;
  }, [id]);
  return null;
}
