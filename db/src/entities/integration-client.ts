import { EntitySchema } from 'typeorm';

/** A machine (an HR system) the administrator allows to push intakes with a client-credentials token. */
export interface IntegrationClient {
  clientId: string;
  name: string;
  registeredBy: string | null;
  registeredAt: Date;
  revokedBy: string | null;
  revokedAt: Date | null;
}

export const IntegrationClientEntity = new EntitySchema<IntegrationClient>({
  name: 'IntegrationClient',
  tableName: 'integration_clients',
  columns: {
    clientId: { name: 'client_id', type: 'text', primary: true },
    name: { type: 'text' },
    registeredBy: { name: 'registered_by', type: 'uuid', nullable: true },
    registeredAt: { name: 'registered_at', type: 'timestamptz', createDate: true },
    revokedBy: { name: 'revoked_by', type: 'uuid', nullable: true },
    revokedAt: { name: 'revoked_at', type: 'timestamptz', nullable: true },
  },
  // Constraints and indexes as the migrations build them (tests/integration/entities-schema.test.ts).
  checks: [{ name: 'integration_clients_client_id_check', expression: '((length(client_id) >= 3) AND (length(client_id) <= 128))' }],
  foreignKeys: [
    { name: 'integration_clients_registered_by_fkey', target: 'User', columnNames: ['registered_by'], referencedColumnNames: ['id'] },
    { name: 'integration_clients_revoked_by_fkey', target: 'User', columnNames: ['revoked_by'], referencedColumnNames: ['id'] },
  ],
});
