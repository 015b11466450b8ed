// The audit log is written by the API and the worker alike; its one writer lives in the db workspace.
export { recordAudit, type AuditActor, type AuditEntry } from '@ratewarden/db/audit-log';
