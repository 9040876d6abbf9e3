/** Formats shared by several request envelopes: an e-mail address and an id. */
import { z } from 'zod';
import { rawText } from '@/lib/text-schema';

export const emailSchema = rawText('The e-mail address', 'Enter an e-mail address.')
  .trim()
  .toLowerCase()
  .max(254, 'An e-mail address has at most 254 characters.')
  .pipe(z.email({ error: 'Enter a valid e-mail address, like name@example.org.' }))
  .meta({ example: 'lena.vogel@harrowvale.example' });

export const idSchema = z.uuid({ error: 'Must be an id (UUID).' });
