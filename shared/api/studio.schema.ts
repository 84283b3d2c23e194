import '../model/zod-config';
import { z } from 'zod';
import { ROLES } from '../model/roles';
import { emailSchema } from './auth.schema';
import { whole } from './fields.schema';
import { mailedNameSchema } from './text.schema';

/** Studio names appear in invitation mails: one line, no web addresses (security item 31). */
export const studioNameSchema = mailedNameSchema(80);

export const createStudioSchema = z.strictObject({ name: studioNameSchema });
export const updateStudioSchema = z.strictObject({ name: studioNameSchema });

export const roleSchema = z.enum(ROLES, { message: `must be one of ${ROLES.join(', ')}` });

export const inviteSchema = z.strictObject({ email: emailSchema, role: roleSchema });
export const changeRoleSchema = z.strictObject({ role: roleSchema });

/** The activity feed's query string: how many entries (newest first). */
export const activityQuerySchema = z.object({ limit: whole('limit', 1, 200).default(50) });
