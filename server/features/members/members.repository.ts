import { and, asc, eq } from 'drizzle-orm';
import type { Member } from '../../../shared/schemas/member';
import type { Db } from '../../db/client';
import { memberships, users } from '../../db/schema';

const memberColumns = { userId: users.id, name: users.name, email: users.email, role: memberships.role };

export function createMembersRepository(db: Db) {
  return {
    async list(organisationId: string): Promise<Member[]> {
      return db
        .select(memberColumns)
        .from(memberships)
        .innerJoin(users, eq(users.id, memberships.userId))
        .where(eq(memberships.organisationId, organisationId))
        .orderBy(asc(users.name), asc(users.email));
    },

    /** Only a member of this organisation: someone who exists elsewhere is "not found" here. */
    async find(organisationId: string, userId: string): Promise<Member | null> {
      const [row] = await db
        .select(memberColumns)
        .from(memberships)
        .innerJoin(users, eq(users.id, memberships.userId))
        .where(and(eq(memberships.organisationId, organisationId), eq(memberships.userId, userId)))
        .limit(1);
      return row ?? null;
    },
  };
}
export type MembersRepository = ReturnType<typeof createMembersRepository>;
