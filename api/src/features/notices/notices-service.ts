import type { DataSource } from 'typeorm';
import { rows } from '@ratewarden/db';
import type { NoticeDetail, NoticeListQuery, NoticeSummary } from '@ratewarden/shared/notices';
import type { Principal } from '@ratewarden/shared/permissions';
import { userOf } from '../../auth/authorize';
import { AppError } from '../../lib/app-error';

type Row = Record<string, any>;

const COLUMNS = `n.id, n.flag_id, n.kind, n.subject, to_char(n.period, 'YYYY-MM-DD') AS period, n.completeness, n.created_at, n.read_at, n.state AS mail_state`;

const summaryOf = (r: Row): NoticeSummary => ({
  id: r.id,
  flagId: r.flag_id,
  kind: r.kind,
  subject: r.subject,
  period: r.period,
  completeness: r.completeness,
  state: r.read_at ? 'read' : 'new',
  createdAt: new Date(r.created_at).toISOString(),
  readAt: r.read_at ? new Date(r.read_at).toISOString() : null,
  mailState: r.mail_state,
});

/**
 * A person's inbox: the notices addressed to their e-mail address, newest first. Nobody reads
 * another's notices (the administrator included): the address is the signed-in person's own.
 */
export async function listNotices(ds: DataSource, principal: Principal, q: NoticeListQuery): Promise<NoticeSummary[]> {
  const user = userOf({ principal });
  const rows: Row[] = await ds.query(
    `SELECT ${COLUMNS} FROM notices n
     WHERE lower(n.recipient) = lower($1)
       AND ($2::text IS NULL OR ($2 = 'new') = (n.read_at IS NULL)) AND ($3::text IS NULL OR n.kind = $3) AND ($4::uuid IS NULL OR n.flag_id = $4)
     ORDER BY n.created_at DESC, n.id LIMIT 500`,
    [user.email, q.state ?? null, q.kind ?? null, q.flagId ?? null],
  );
  return rows.map(summaryOf);
}

export async function unreadNotices(ds: DataSource, principal: Principal): Promise<{ unread: number }> {
  const user = userOf({ principal });
  const [r]: Row[] = await ds.query(`SELECT count(*)::int AS n FROM notices WHERE lower(recipient) = lower($1) AND read_at IS NULL`, [user.email]);
  return { unread: r!.n };
}

/** One notice of the reader's, marked read the first time it is opened. */
export async function openNotice(ds: DataSource, principal: Principal, id: string): Promise<NoticeDetail> {
  const user = userOf({ principal });
  const [r] = await rows<Row>(
    ds,
    `UPDATE notices n SET read_at = coalesce(n.read_at, now()) WHERE n.id = $1 AND lower(n.recipient) = lower($2) RETURNING ${COLUMNS}, n.body`,
    [id, user.email],
  );
  if (!r) throw new AppError('not_found', 'no such notice in your inbox');
  return { ...summaryOf(r), text: r.body };
}

/** Marks one of the reader's notices new again. */
export async function markUnread(ds: DataSource, principal: Principal, id: string): Promise<NoticeSummary> {
  const user = userOf({ principal });
  const [r] = await rows<Row>(ds, `UPDATE notices n SET read_at = NULL WHERE n.id = $1 AND lower(n.recipient) = lower($2) RETURNING ${COLUMNS}`, [
    id,
    user.email,
  ]);
  if (!r) throw new AppError('not_found', 'no such notice in your inbox');
  return summaryOf(r);
}
