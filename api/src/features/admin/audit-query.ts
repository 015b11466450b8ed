import type { DataSource } from 'typeorm';
import { rows } from '@ratewarden/db';
import type { AuditQuery } from '@ratewarden/shared/admin';

/** One audit entry with its actor's and target's names as their tables have them now. */
export interface AuditPageRow {
  id: string;
  at: Date;
  actor_label: string;
  actor_name: string | null;
  action: string;
  target: string | null;
  target_name: string | null;
  detail: Record<string, unknown>;
  ip: string | null;
}

/**
 * One page of the audit log, newest first, filtered. Stays SQL: the page is a CTE, and each
 * entry's target is named from whichever table its kind points to.
 */
export async function auditPage(ds: DataSource, q: AuditQuery): Promise<AuditPageRow[]> {
  const where: string[] = [];
  const args: unknown[] = [];
  const add = (sql: string, value: unknown) => {
    args.push(value);
    where.push(sql.replace('?', `$${args.length}`));
  };
  if (q.action) add(`a.action LIKE ? || '%'`, q.action);
  if (q.actor) add(`(a.actor_label ILIKE '%' || ? || '%' OR au.name ILIKE '%' || $${args.length + 1} || '%')`, q.actor);
  if (q.from) add(`a.at >= ?::timestamptz`, q.from);
  if (q.to) add(`a.at < ?::timestamptz`, q.to);
  if (q.before) add(`a.id < ?`, q.before);
  args.push(q.limit);
  // The page first, then each entry's actor and target named from their tables as they are now.
  return rows<AuditPageRow>(
    ds,

    `WITH page AS (
         SELECT a.id, a.at, a.actor_label, au.name AS actor_name, a.action, a.target, a.detail, a.ip,
                split_part(a.target, ':', 1) AS kind, substr(a.target, length(split_part(a.target, ':', 1)) + 2) AS ref
           FROM audit_events a LEFT JOIN users au ON au.id = a.actor_id
           ${where.length ? `WHERE ${where.join(' AND ')}` : ''}
          ORDER BY a.id DESC LIMIT $${args.length})
       SELECT p.id, p.at, p.actor_label, p.actor_name, p.action, p.target, p.detail, p.ip,
              CASE p.kind
                WHEN 'user' THEN tu.name
                WHEN 'exposure_group' THEN tg.name
                WHEN 'outcome' THEN tout.name
                WHEN 'watch_rule' THEN tr.name
                WHEN 'intake' THEN ti.file_name
                WHEN 'client' THEN tc.name
                WHEN 'run' THEN 'run ' || trun.number
                WHEN 'flag' THEN fg.name || ', ' || fo.name
              END AS target_name
         FROM page p
         LEFT JOIN users tu ON p.kind = 'user' AND tu.id::text = p.ref
         LEFT JOIN exposure_groups tg ON p.kind = 'exposure_group' AND tg.id::text = p.ref
         LEFT JOIN outcomes tout ON p.kind = 'outcome' AND tout.id::text = p.ref
         LEFT JOIN watch_rules tr ON p.kind = 'watch_rule' AND tr.id::text = p.ref
         LEFT JOIN intakes ti ON p.kind = 'intake' AND ti.id::text = p.ref
         LEFT JOIN integration_clients tc ON p.kind = 'client' AND tc.client_id = p.ref
         LEFT JOIN runs trun ON p.kind = 'run' AND trun.id::text = p.ref
         LEFT JOIN flags tf ON p.kind = 'flag' AND tf.id::text = p.ref
         LEFT JOIN exposure_groups fg ON fg.id = tf.exposure_group_id
         LEFT JOIN outcomes fo ON fo.id = tf.outcome_id
        ORDER BY p.id DESC`,
    args,
  );
}
