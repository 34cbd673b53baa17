import type { Member } from '../../../shared/schemas/member';
import { notFound } from '../../lib/errors';
import type { MembersRepository } from './members.repository';

export function createMembersService(repo: MembersRepository) {
  return {
    list: (organisationId: string): Promise<Member[]> => repo.list(organisationId),
    async get(organisationId: string, userId: string): Promise<Member> {
      const member = await repo.find(organisationId, userId);
      if (!member) throw notFound('That person');
      return member;
    },
  };
}
export type MembersService = ReturnType<typeof createMembersService>;
