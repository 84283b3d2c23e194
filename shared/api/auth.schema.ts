import '../model/zod-config';
import { z } from 'zod';
import { ROLES } from '../model/roles';

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

export const signUpSchema = z.strictObject({
  email: emailSchema,
  displayName: z.string().trim().min(1, { message: 'is required' }).max(80, { message: 'must be at most 80 characters' }),
  password: passwordSchema,
});
export type SignUpBody = z.infer<typeof signUpSchema>;

export const signInSchema = z.strictObject({
  email: z.string().trim().toLowerCase().max(254),
  password: z.string().max(1024),
});

export const passwordResetSchema = z.strictObject({ email: emailSchema });

export const passwordResetConfirmSchema = z.strictObject({
  token: z.string().regex(/^[A-Za-z0-9_-]{20,100}$/, { message: 'is not a reset token' }),
  password: passwordSchema,
});

export const studioNameSchema = z.string().trim().min(1, { message: 'is required' }).max(80, { message: 'must be at most 80 characters' });

export const createStudioSchema = z.strictObject({ name: studioNameSchema });
export const updateStudioSchema = z.strictObject({ name: studioNameSchema });

export const roleSchema = z.enum(ROLES, { message: `must be one of ${ROLES.join(', ')}` });

export const inviteSchema = z.strictObject({ email: emailSchema, role: roleSchema });
export const changeRoleSchema = z.strictObject({ role: roleSchema });
