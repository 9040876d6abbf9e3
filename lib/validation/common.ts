import { z } from 'zod';

/** Trimmed text with a length range; control characters other than newline and tab are refused. */
export function text(label: string, min: number, max: number) {
  return z
    .string({ error: `${label} must be text.` })
    .trim()
    .min(min, min === 1 ? `${label} is required.` : `${label} needs at least ${min} characters.`)
    .max(max, `${label} can be at most ${max} characters.`)
    .refine((v) => !/[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F]/.test(v), `${label} contains control characters.`);
}

export const emailSchema = z
  .string({ error: 'Enter an e-mail address.' })
  .trim()
  .toLowerCase()
  .max(254, 'An e-mail address has at most 254 characters.')
  .pipe(z.email({ error: 'Enter a valid e-mail address, like name@example.org.' }))
  .meta({ example: 'lena.vogel@harrowvale.example' });

export const idSchema = z.uuid({ error: 'Must be an id (UUID).' });
