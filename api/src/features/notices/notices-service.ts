import type { DataSource, Repository } from 'typeorm';
import { IsNull } from 'typeorm';
import { NoticeEntity, type NoticeRow } from '@ratewarden/db';
import type { NoticeDetail, NoticeListQuery, NoticeSummary } from '@ratewarden/shared/notices';
import type { Principal } from '@ratewarden/shared/permissions';
import { userOf } from '../../auth/authorize';
import { AppError } from '../../lib/app-error';

type Summarized = Pick<NoticeRow, 'id' | 'flagId' | 'kind' | 'subject' | 'period' | 'completeness' | 'createdAt' | 'readAt' | 'state'>;

/** The columns a summary reads (the text only when a notice is opened). */
const SUMMARY_COLUMNS = ['id', 'flagId', 'kind', 'subject', 'period', 'completeness', 'createdAt', 'readAt', 'state'].map((c) => `n.${c}`);

/** A notice in the inbox list, as the API answers it. */
const summaryOf = (n: Summarized): NoticeSummary => ({
  id: n.id,
  flagId: n.flagId,
  kind: n.kind,
  subject: n.subject,
  period: n.period,
  completeness: n.completeness,
  state: n.readAt ? 'read' : 'new',
  createdAt: n.createdAt.toISOString(),
  readAt: n.readAt?.toISOString() ?? null,
  mailState: n.state,
});

/** A person's own notices: addressed to their e-mail address, in any case. */
const addressedTo = (notices: Repository<NoticeRow>, email: string) => notices.createQueryBuilder('n').where('lower(n.recipient) = lower(:email)', { email });

/**
 * A person's inbox: the notices addressed to their e-mail address, newest first. Nobody reads
 * another's notices (the administrator included): the address is the signed-in person's own.
 */
export async function listNotices(ds: DataSource, principal: Principal, q: NoticeListQuery): Promise<NoticeSummary[]> {
  const user = userOf({ principal });
  const query = addressedTo(ds.getRepository(NoticeEntity), user.email).select(SUMMARY_COLUMNS);
  if (q.state) query.andWhere(q.state === 'new' ? 'n.readAt IS NULL' : 'n.readAt IS NOT NULL');
  if (q.kind) query.andWhere('n.kind = :kind', { kind: q.kind });
  if (q.flagId) query.andWhere('n.flagId = :flagId', { flagId: q.flagId });
  const notices = await query.orderBy('n.createdAt', 'DESC').addOrderBy('n.id').limit(500).getMany();
  return notices.map(summaryOf);
}

export async function unreadNotices(ds: DataSource, principal: Principal): Promise<{ unread: number }> {
  const user = userOf({ principal });
  return { unread: await addressedTo(ds.getRepository(NoticeEntity), user.email).andWhere('n.readAt IS NULL').getCount() };
}

async function ownNotice(notices: Repository<NoticeRow>, email: string, id: string): Promise<NoticeRow> {
  const notice = await addressedTo(notices, email).andWhere('n.id = :id', { id }).getOne();
  if (!notice) throw new AppError('not_found', 'no such notice in your inbox');
  return notice;
}

/** One notice of the reader's, marked read the first time it is opened. */
export async function openNotice(ds: DataSource, principal: Principal, id: string): Promise<NoticeDetail> {
  const user = userOf({ principal });
  const notices = ds.getRepository(NoticeEntity);
  let notice = await ownNotice(notices, user.email, id);
  if (!notice.readAt) {
    // The first opening stays the time it was read, whichever of two at once comes first.
    await notices.update({ id, readAt: IsNull() }, { readAt: () => 'now()' });
    notice = await ownNotice(notices, user.email, id);
  }
  return { ...summaryOf(notice), text: notice.body };
}

/** Marks one of the reader's notices new again. */
export async function markUnread(ds: DataSource, principal: Principal, id: string): Promise<NoticeSummary> {
  const user = userOf({ principal });
  const notices = ds.getRepository(NoticeEntity);
  await ownNotice(notices, user.email, id);
  await notices.update(id, { readAt: null });
  return summaryOf(await ownNotice(notices, user.email, id));
}
