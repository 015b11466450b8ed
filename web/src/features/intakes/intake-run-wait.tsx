import { PendingRunNote } from '../../components/status/pending-run-note';
import { usePendingRun } from '../../api/get-pending-run';

/** An applied intake's run not taken up yet: when it comes (after uploads settle). */
export function IntakeRunWait() {
  const pending = usePendingRun();
  return pending.data?.pending ? <PendingRunNote pending={pending.data.pending} /> : null;
}
