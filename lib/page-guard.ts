import 'server-only';
import { notFound, redirect } from 'next/navigation';
import { AppError } from './errors';

/** For pages: a missing or hidden item becomes the 404 page, a missing session the sign-in page. */
export async function load<T>(promise: Promise<T>, returnTo?: string): Promise<T> {
  try {
    return await promise;
  } catch (err) {
    if (err instanceof AppError) {
      if (err.code === 'not_found') notFound();
      if (err.code === 'unauthorized') redirect(`/sign-in${returnTo ? `?callbackUrl=${encodeURIComponent(returnTo)}` : ''}`);
    }
    throw err;
  }
}
