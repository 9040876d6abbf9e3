/**
 * Sign-in, sign-up and password-reset inputs. Shared by the forms (zodResolver) and the server
 * actions (safeParse). The common-password check needs a 49,000-entry list, so it runs on the
 * server only (lib/auth/password.ts) and is not part of these schemas.
 */
import { z } from 'zod';
import { rawText, text } from '@/lib/text-schema';
import { emailSchema } from './common';

export const PASSWORD_MIN = 10;
export const PASSWORD_MAX = 128;

export const passwordSchema = rawText('The password', 'Enter a password.')
  .min(PASSWORD_MIN, `Use at least ${PASSWORD_MIN} characters. A short phrase is easier to remember.`)
  .max(PASSWORD_MAX, `Use at most ${PASSWORD_MAX} characters.`);

export const signInSchema = z.object({
  email: emailSchema,
  password: rawText('The password', 'Enter your password.').min(1, 'Enter your password.').max(PASSWORD_MAX, `Use at most ${PASSWORD_MAX} characters.`),
  callbackUrl: text('The return address', 0, 500).optional(),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const signUpSchema = z.object({
  name: text('Name', 1, 100),
  email: emailSchema,
  password: passwordSchema,
  /** Where to go after the address is confirmed and the user signs in (an invitation, say). */
  callbackUrl: text('The return address', 0, 500).optional(),
});
export type SignUpInput = z.infer<typeof signUpSchema>;

export const magicLinkSchema = signInSchema.pick({ email: true, callbackUrl: true });
export type MagicLinkInput = z.infer<typeof magicLinkSchema>;

export const resetRequestSchema = signInSchema.pick({ email: true });
export type ResetRequestInput = z.infer<typeof resetRequestSchema>;

export const resetPasswordSchema = z
  .object({
    token: rawText('The reset link')
      .min(20, 'This reset link is incomplete. Open the link from the e-mail again.')
      .max(200, 'This reset link is too long. Open the link from the e-mail again.'),
    password: passwordSchema,
    confirm: rawText('The repeated password', 'Repeat the password.'),
  })
  .refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'The two passwords do not match.' });
export type ResetPasswordInput = z.infer<typeof resetPasswordSchema>;
