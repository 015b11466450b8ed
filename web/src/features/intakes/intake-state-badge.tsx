import type { IntakeState } from '@ratewarden/shared/intake';
import { StateTag, type Tone } from '../../components/status/state-tag';

/** An intake's state in the status family: shape and word, the colour repeating them. */
const tone: Record<IntakeState, Tone> = {
  received: 'neutral',
  checked: 'attention',
  applied: 'good',
  rejected: 'alarm',
  superseded: 'muted',
};

export function IntakeStateBadge({ state }: { state: IntakeState }) {
  return <StateTag text={state} tone={tone[state]} />;
}
