/**
 * The Message-ID of a threshold notice, fixed by the notice's id: every attempt to deliver one
 * notice carries the same Message-ID, so a receiving server or mail client that has it already
 * (an earlier attempt whose acknowledgement never reached the sender) keeps only one copy.
 *
 * @example noticeMessageId('0b6f…') // '<notice-0b6f…@ratewarden.local>'
 */
export function noticeMessageId(noticeId: string): string {
  return `<notice-${noticeId}@ratewarden.local>`;
}
