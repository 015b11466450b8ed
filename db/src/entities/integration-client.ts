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
});
