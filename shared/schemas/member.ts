import { z } from 'zod';
import { RoleSchema, UuidSchema } from './common';

/** A person in an organisation, with their role there. */
export const MemberSchema = z.object({
  userId: UuidSchema,
  name: z.string(),
  email: z.string(),
  role: RoleSchema,
});
export type Member = z.infer<typeof MemberSchema>;

export const MemberListSchema = z.object({ members: z.array(MemberSchema) });
export type MemberList = z.infer<typeof MemberListSchema>;
