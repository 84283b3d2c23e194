import '../model/zod-config';
import { z } from 'zod';
import { mailedNameSchema } from './text.schema';

/** Passwords: 8–128 characters of any Unicode, counted as code points (ASVS 5.0 6.2). */
export const passwordSchema = z
  .string()
  .refine((p) => [...p].length >= 8, { message: 'must be at least 8 characters' })
  .refine((p) => [...p].length <= 128, { message: 'must be at most 128 characters' });

export const emailSchema = z
  .string()
  .trim()
  .toLowerCase()
  .max(254, { message: 'must be at most 254 characters' })
  .pipe(z.email({ message: 'must be an e-mail address such as name@example.com' }));

const linkToken = (what: string) => z.string().regex(/^[A-Za-z0-9_-]{20,100}$/, { message: `is not ${what}` });

export const signUpSchema = z.strictObject({
  email: emailSchema,
  displayName: mailedNameSchema(80),
  password: passwordSchema,
  /** The token of the invite whose mailed link led here: it proves the address, so no second mail is needed. */
  inviteToken: linkToken('an invite token').optional(),
});
export type SignUpBody = z.infer<typeof signUpSchema>;

export const signInSchema = z.strictObject({
  email: z.string().trim().toLowerCase().max(254),
  password: z.string().max(1024),
});

export const passwordResetSchema = z.strictObject({ email: emailSchema });

export const passwordResetConfirmSchema = z.strictObject({
  token: linkToken('a reset token'),
  password: passwordSchema,
});

export const verifyEmailSchema = z.strictObject({ token: linkToken('a verification token') });

export const updateProfileSchema = z.strictObject({ displayName: mailedNameSchema(80) });

export const changePasswordSchema = z.strictObject({
  currentPassword: z.string().max(1024),
  newPassword: passwordSchema,
});
