import { PageSkeleton } from '@/components/ui/page-skeleton';

/**
 * Streams below the study layout, which has already answered 404 for a study the user may not
 * see: a loading boundary above that check would start a 200 response before it ran.
 */
export default PageSkeleton;
