/**
 * Sign-in, sign-up and password-reset inputs. Shared by the forms (zodResolver) and the server
 * actions (safeParse). The common-password check needs a 49,000-entry list, so it runs on the
 * server only (lib/auth/password.ts) and is not part of these schemas.
 */
import { z } from 'zod';
import { emailSchema, text } from './common';

export const PASSWORD_MIN = 10;
export const PASSWORD_MAX = 128;

export const passwordSchema = z
  .string({ error: 'Enter a password.' })
  .min(PASSWORD_MIN, `Use at least ${PASSWORD_MIN} characters. A short phrase is easier to remember.`)
  .max(PASSWORD_MAX, `Use at most ${PASSWORD_MAX} characters.`);

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, 'Enter your password.').max(PASSWORD_MAX),
  callbackUrl: z.string().max(500).optional(),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const signUpSchema = z.object({
  name: text('Name', 1, 100),
  email: emailSchema,
  password: passwordSchema,
  /** Where to go after the address is confirmed and the user signs in (an invitation, say). */
  callbackUrl: z.string().max(500).optional(),
});
export type SignUpInput = z.infer<typeof signUpSchema>;

export const magicLinkSchema = signInSchema.pick({ email: true, callbackUrl: true });
export type MagicLinkInput = z.infer<typeof magicLinkSchema>;

export const resetRequestSchema = signInSchema.pick({ email: true });
export type ResetRequestInput = z.infer<typeof resetRequestSchema>;

export const resetPasswordSchema = z
  .object({
    token: z.string().min(20, 'This reset link is incomplete. Open the link from the e-mail again.').max(200),
    password: passwordSchema,
    confirm: z.string(),
  })
  .refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'The two passwords do not match.' });
export type ResetPasswordInput = z.infer<typeof resetPasswordSchema>;
