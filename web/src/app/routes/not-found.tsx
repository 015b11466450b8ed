import { ProblemNotice } from '../../components/feedback/problem-notice';

export function Component() {
  return <ProblemNotice title="Not found" problem={{ code: 'not_found', message: 'There is no page at this address.' }} />;
}
