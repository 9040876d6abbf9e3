import { api } from '@/lib/api/handler';
import type { Unsubscribed } from '@/lib/api/dto';
import { env } from '@/lib/env';
import { unsubscribe } from '@/lib/data/notifications';
import { unsubscribeParamsSchema } from '@/lib/validation/notifications';

/**
 * One-click unsubscribe (RFC 8058): a mail program POSTs `List-Unsubscribe=One-Click` to the
 * address in the message's List-Unsubscribe header. No sign-in: the signed token in the address
 * names the person and the kind. A GET (a mail program that only opens the address) is sent to
 * the confirmation page, which changes nothing until its button is pressed.
 */
export const POST = api(
  async ({ params }): Promise<Unsubscribed> => {
    const done = await unsubscribe(params.token);
    return { scope: done.scope, settings: done.settings };
  },
  { public: true, params: unsubscribeParamsSchema },
);

export const GET = api(
  async ({ params }) => Response.redirect(new URL(`/unsubscribe/${encodeURIComponent(params.token)}`, env().APP_URL), 303),
  { public: true, params: unsubscribeParamsSchema },
);
