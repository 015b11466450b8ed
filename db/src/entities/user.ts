import { EntitySchema } from 'typeorm';
import type { Role } from '@ratewarden/shared/domain';
import { timestampColumns, type Timestamps } from './base';

/** A person known to Ratewarden. The identity provider says who; this row says what they may do. */
export interface User extends Timestamps {
  id: string;
  /** Issuer and subject from the identity provider, `iss|sub`. */
  subject: string | null;
  email: string;
  name: string;
  role: Role | null;
  lastSignInAt: Date | null;
}

export const UserEntity = new EntitySchema<User>({
  name: 'User',
  tableName: 'users',
  columns: {
    id: { type: 'uuid', primary: true, generated: 'uuid' },
    subject: { type: 'text', unique: true, nullable: true },
    email: { type: 'text' },
    name: { type: 'text' },
    role: { type: 'text', nullable: true },
    lastSignInAt: { name: 'last_sign_in_at', type: 'timestamptz', nullable: true },
    ...timestampColumns,
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [
    { name: 'users_role_check', expression: "(role = ANY (ARRAY['hygienist'::text, 'safety_manager'::text, 'physician'::text, 'administrator'::text]))" },
  ],
  indices: [{ name: 'users_email_unbound', columns: [], unique: true, where: '(subject IS NULL)', synchronize: false }],
});
