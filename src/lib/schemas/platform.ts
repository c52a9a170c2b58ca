/** Request schemas for sign-in, teams, members and invitations, shared by forms and API routes. */
import { z } from 'zod';
import { ROLES } from '../permissions';

export const MIN_PASSWORD = 10;

export const emailSchema = z.string().trim().toLowerCase().email('Enter a valid e-mail address.').max(254);
export const passwordSchema = z
  .string()
  .min(MIN_PASSWORD, `Use at least ${MIN_PASSWORD} characters.`)
  .max(128, 'Use at most 128 characters.');

export const signInSchema = z.object({ email: emailSchema, password: z.string().min(1, 'Enter your password.') });
export const signUpSchema = z.object({
  name: z.string().trim().min(1, 'Enter your name.').max(100),
  email: emailSchema,
  password: passwordSchema,
});
export const forgotPasswordSchema = z.object({ email: emailSchema });
export const resetPasswordSchema = z
  .object({ password: passwordSchema, confirm: z.string() })
  .refine((v) => v.password === v.confirm, { path: ['confirm'], message: 'The two passwords differ.' });

export const teamNameSchema = z.string().trim().min(2, 'Use at least 2 characters.').max(80, 'Use at most 80 characters.');
export const createTeamSchema = z.strictObject({ name: teamNameSchema });
export const renameTeamSchema = z.strictObject({ name: teamNameSchema });
export const switchTeamSchema = z.strictObject({ teamId: z.string().min(1) });

export const assignableRoleSchema = z.enum(ROLES).refine((r) => r !== 'owner', {
  message: 'Ownership is handed over with "transfer ownership", not by a role change.',
});
export const inviteSchema = z.strictObject({ email: emailSchema, role: assignableRoleSchema });
export const changeRoleSchema = z.strictObject({ role: assignableRoleSchema });
export const transferOwnershipSchema = z.strictObject({ userId: z.string().min(1) });
export const acceptInvitationSchema = z.strictObject({ token: z.string().min(16).max(200) });
export const deleteTeamSchema = z.strictObject({ confirmName: z.string() });
