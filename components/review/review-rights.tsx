'use client';

import { createContext, useContext, type ReactNode } from 'react';

/** What the signed-in member may do on a study's review, set once by the study layout for every marker below it. */
const ReviewRightsContext = createContext<{ canComment: boolean }>({ canComment: false });

export function ReviewRights({ canComment, children }: { canComment: boolean; children: ReactNode }) {
  return <ReviewRightsContext.Provider value={{ canComment }}>{children}</ReviewRightsContext.Provider>;
}

export function useReviewRights() {
  return useContext(ReviewRightsContext);
}
