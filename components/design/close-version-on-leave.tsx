'use client';

import { useEffect } from 'react';
import { closeMyVersion } from './leave-guard';

/**
 * Sits in the Design tab's layout, which stays while the author moves between steps: when it
 * goes (another tab of the app) or the page is hidden for good (closed, reloaded), the author's
 * open version is closed, after their last save.
 */
export function CloseVersionOnLeave({ studyId }: { studyId: string }) {
  useEffect(() => {
    const onPageHide = (e: PageTransitionEvent) => {
      if (!e.persisted) closeMyVersion(studyId);
    };
    window.addEventListener('pagehide', onPageHide);
    return () => {
      window.removeEventListener('pagehide', onPageHide);
      closeMyVersion(studyId, { afterUnmount: true });
    };
  }, [studyId]);
  return null;
}
