import type { DataSource } from 'typeorm';
import { FlagNoteEntity } from '@ratewarden/db/entities/flag-note';
import type { FlagNote } from '@ratewarden/shared/flags';
import type { Principal } from '@ratewarden/shared/permissions';
import { recordAudit } from '../../audit/audit-log';
import { userOf } from '../../auth/authorize';
import { flagScopeOf, getFlag } from './flags-service';

type Row = Record<string, any>;

/**
 * Clinical notes on a flag: physicians only (the routes ask `cases:*`), on flags they may see,
 * oldest first. Reading them is audited as a read of case-level data; the audit entry of a new
 * note names the flag, never the text.
 */
export async function flagNotes(ds: DataSource, principal: Principal, flagId: string, ip?: string): Promise<FlagNote[]> {
  await getFlag(ds, flagId, await flagScopeOf(ds, principal));
  const rows: Row[] = await ds.query(
    `SELECT n.id::text AS id, n.text, u.email AS author, n.created_at FROM flag_notes n JOIN users u ON u.id = n.author_id WHERE n.flag_id = $1 ORDER BY n.created_at, n.id`,
    [flagId],
  );
  await recordAudit(ds, { actor: principal, action: 'cases.read', target: `flag:${flagId}`, detail: { read: 'clinical notes' }, ip });
  return rows.map((r) => ({ id: r.id, text: r.text, author: r.author, createdAt: new Date(r.created_at).toISOString() }));
}

export async function addFlagNote(ds: DataSource, principal: Principal, flagId: string, text: string, ip?: string): Promise<FlagNote[]> {
  const user = userOf({ principal });
  await getFlag(ds, flagId, await flagScopeOf(ds, principal));
  await ds.transaction(async (em) => {
    // Insert only: a trigger refuses any UPDATE or DELETE of a note.
    await em.getRepository(FlagNoteEntity).insert({ flagId, authorId: user.id, text });
    await recordAudit(em, { actor: principal, action: 'flag.clinical_note', target: `flag:${flagId}`, ip });
  });
  return flagNotes(ds, principal, flagId, ip);
}
