/**
 * Escalations of an open flag and their withdrawal. Each escalation raised the flag's worst value
 * past the worst before it (`previousWorst`, kept on the event). When a later run finds the value
 * back at or below that earlier level, the escalation no longer holds: it is withdrawn (a
 * follow-up notice says so) and the flag's worst value goes back to the level before it, so a
 * real worsening later is reported again.
 */

/** A run-written event of one flag, oldest first, as stored in flag_events. */
export interface RunFlagEvent {
  kind: string;
  detail: { previousWorst?: unknown; withdrawn?: unknown };
}

/** The levels before each escalation still standing, oldest first. */
export function standingEscalations(events: readonly RunFlagEvent[]): number[] {
  const standing: number[] = [];
  for (const e of events) {
    if (e.kind === 'escalated' && typeof e.detail.previousWorst === 'number') standing.push(e.detail.previousWorst);
    const withdrawn = typeof e.detail.withdrawn === 'number' ? e.detail.withdrawn : 0;
    if (withdrawn > 0) standing.splice(Math.max(0, standing.length - withdrawn));
  }
  return standing;
}

/**
 * What a value still past the rule withdraws: the latest escalations whose level before is at or
 * above it, and the worst value that stands after them (the level before the earliest of those).
 * null: every standing escalation still holds.
 */
export function withdrawnBy(standing: readonly number[], value: number): { withdrawn: number; worstBefore: number } | null {
  let n = 0;
  while (n < standing.length && value <= standing[standing.length - 1 - n]!) n++;
  return n === 0 ? null : { withdrawn: n, worstBefore: standing[standing.length - n]! };
}
