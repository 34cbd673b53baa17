/** Tenants, people and who may do what where. Every other row belongs to one organisation. */
import { sql } from 'drizzle-orm';
import { bigint, index, json, pgEnum, pgTable, primaryKey, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { ROLES } from '../../../shared/schemas/common';
import { timestamps } from './columns';

export const roleEnum = pgEnum('role', ROLES);

export const organisations = pgTable('organisations', {
  id: uuid('id').primaryKey().defaultRandom(),
  name: text('name').notNull(),
  /** Last change sequence handed out in this organisation; bumped atomically on every synced write. */
  changeSeq: bigint('change_seq', { mode: 'number' }).notNull().default(0),
  ...timestamps(),
});

export const users = pgTable(
  'users',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    email: text('email').notNull(),
    name: text('name').notNull(),
    /** scrypt hash in PHC-like form: scrypt$N$r$p$salt$hash (server/features/auth/password.ts). */
    passwordHash: text('password_hash').notNull(),
    ...timestamps(),
  },
  (t) => [uniqueIndex('users_email_lower_idx').on(sql`lower(${t.email})`)],
);

export const memberships = pgTable(
  'memberships',
  {
    userId: uuid('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    organisationId: uuid('organisation_id')
      .notNull()
      .references(() => organisations.id, { onDelete: 'cascade' }),
    role: roleEnum('role').notNull(),
    ...timestamps(),
  },
  (t) => [primaryKey({ columns: [t.userId, t.organisationId] }), index('memberships_org_idx').on(t.organisationId)],
);

/** express-session rows, in the shape connect-pg-simple reads and writes. */
export const sessions = pgTable(
  'session',
  {
    sid: text('sid').primaryKey(),
    sess: json('sess').notNull(),
    expire: timestamp('expire', { precision: 6 }).notNull(),
  },
  (t) => [index('session_expire_idx').on(t.expire)],
);
