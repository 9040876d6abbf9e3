import { api } from '@/lib/api/handler';
import { AppError } from '@/lib/errors';

/**
 * Any /api address that no route handles (/api itself included): the API's JSON error instead
 * of the HTML 404 page. More specific routes (api/v1/…, api/auth/…, api/health) always win over this catch-all.
 */
const noSuchRoute = api(
  async () => {
    throw new AppError('not_found', 'There is no API at this address. The API is described at /api/v1/openapi.json.');
  },
  { public: true },
);

export { noSuchRoute as GET, noSuchRoute as POST, noSuchRoute as PUT, noSuchRoute as PATCH, noSuchRoute as DELETE };
