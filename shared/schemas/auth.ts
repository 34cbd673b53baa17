import { z } from 'zod';
import { RoleSchema, UuidSchema } from './common';

export const EmailSchema = z
  .string({ message: 'Enter an e-mail address.' })
  .trim()
  .toLowerCase()
  .pipe(z.email({ message: 'Enter a valid e-mail address.' }).max(254, 'E-mail address is too long.'));

/** Passwords: at least 10 characters; no composition rules (NIST SP 800-63B). */
export const PasswordSchema = z
  .string({ message: 'Enter a password.' })
  .min(10, 'Use at least 10 characters.')
  .max(200, 'Use at most 200 characters.');

export const SignInSchema = z.object({
  email: EmailSchema,
  password: z.string({ message: 'Enter your password.' }).min(1, 'Enter your password.').max(200),
});
export type SignIn = z.infer<typeof SignInSchema>;

export const PasswordResetRequestSchema = z.object({ email: EmailSchema });
export const PasswordResetConfirmSchema = z.object({
  token: z.string().min(20).max(200),
  password: PasswordSchema,
});

export const InvitationCreateSchema = z.object({ email: EmailSchema, role: RoleSchema });
export const InvitationAcceptSchema = z.object({
  name: z.string().trim().min(1, 'Enter your name.').max(120),
  password: PasswordSchema,
});
export const InvitationTokenParamsSchema = z.object({ token: z.string().min(20).max(200) });

export const MembershipSchema = z.object({
  organisationId: UuidSchema,
  organisationName: z.string(),
  role: RoleSchema,
});
export type Membership = z.infer<typeof MembershipSchema>;

export const SessionUserSchema = z.object({
  id: UuidSchema,
  email: z.string(),
  name: z.string(),
});

/** GET /api/auth/session and the body of a successful sign-in. */
export const SessionSchema = z.object({
  user: SessionUserSchema,
  memberships: z.array(MembershipSchema),
});
export type Session = z.infer<typeof SessionSchema>;

export const InvitationPreviewSchema = z.object({
  email: z.string(),
  organisationName: z.string(),
  role: RoleSchema,
  expiresAt: z.string(),
  hasAccount: z.boolean(),
});
export type InvitationPreview = z.infer<typeof InvitationPreviewSchema>;
