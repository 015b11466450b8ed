import type { CaseReview as ReviewEntity } from '@ratewarden/db/entities/case-review';
import type { CaseReview } from '@ratewarden/shared/cases';

/** A physician's decision and its author as the case reads select it: `case_reviews r` joined to the deciding user under `userAlias`. */
export const reviewColumns = (userAlias: string): string =>
  `r.id::text AS review_id, r.decision, r.from_status, r.to_status, r.reason, ${userAlias}.email AS decided_by, r.decided_at`;

/** The row `reviewColumns` selects. */
export interface ReviewRow {
  review_id: string;
  decision: ReviewEntity['decision'];
  from_status: ReviewEntity['fromStatus'];
  to_status: ReviewEntity['toStatus'];
  reason: string;
  decided_by: string;
  decided_at: Date;
}

/** `ReviewRow` as the API answers it. */
export const reviewOf = (r: ReviewRow): CaseReview => ({
  id: r.review_id,
  decision: r.decision,
  fromStatus: r.from_status,
  toStatus: r.to_status,
  reason: r.reason,
  decidedBy: r.decided_by,
  decidedAt: new Date(r.decided_at).toISOString(),
});
