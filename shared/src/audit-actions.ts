/**
 * The audit log's actions and targets in words, for people reading the log: one place, read by
 * the API (to name targets) and the web app (labels and the action filter). An action not listed
 * here reads as its code.
 */
export const auditActionLabels: Record<string, string> = {
  'audiograms.apply': 'Applied audiograms (threshold shifts derived)',
  'auth.sign_in': 'Signed in',
  'auth.sign_out': 'Signed out',
  'cases.read': 'Read case-level records',
  'cases.export': 'Exported case-level records',
  'case.review': 'Reviewed a case',
  'case.conflict_resolve': "Decided a case list's conflict with a physician's decision",
  'client.registered': 'Registered an integration client',
  'client.revoked': 'Revoked an integration client',
  'flag.raise': 'Flag raised by a run',
  'flag.review': 'Started reviewing a flag',
  'flag.close': 'Closed a flag',
  'flag.clinical_note': 'Wrote a clinical note on a flag',
  'group.create': 'Created an exposure group',
  'group.update': 'Changed an exposure group',
  'group.set_reference': 'Made a group the reference',
  'intake.receive': 'Received an intake',
  'intake.apply': 'Applied an intake',
  'intake.discard': 'Discarded an intake',
  'intake.duplicate': 'Sent an intake already received',
  'intake.expire': 'Intake expired unapplied',
  'intake.reject': 'Intake rejected',
  'intake.restore': 'Restored an earlier intake',
  'outcome.create': 'Created an outcome',
  'outcome.update': 'Changed an outcome',
  'period.close': 'Closed a reporting month',
  'period.reopen': 'Reopened a reporting month',
  'reference.apply': 'Uploaded reference rates',
  'reference.reject': 'Reference rates rejected',
  'rule.create': 'Created a watch rule',
  'rule.update': 'Changed a watch rule',
  'rule.delete': 'Deleted a watch rule',
  'run.request': 'Asked for a run',
  'settings.change': 'Changed the analysis settings',
  'site.create': 'Created a site',
  'site.rename': 'Renamed a site',
  'site.retire': 'Retired a site',
  'site.reinstate': 'Reinstated a retired site',
  'user.provisioned': 'Added a person',
  'user.access_changed': "Changed a person's access",
};

export function auditActionWords(action: string): string {
  return auditActionLabels[action] ?? action;
}

/** The kinds of target an entry names (`<kind>:<id>`), in words. */
export const auditTargetKinds: Record<string, string> = {
  user: 'person',
  client: 'integration client',
  exposure_group: 'exposure group',
  outcome: 'outcome',
  flag: 'flag',
  case_event: 'case version',
  intake: 'intake',
  period: 'reporting month',
  run: 'run',
  run_request: 'run request',
  settings: 'analysis settings version',
  site: 'site',
  watch_rule: 'watch rule',
};

/** "sitesIds" → "sites ids", "closeReason" → "close reason": a detail's field name in words. */
export function fieldWords(key: string): string {
  return key
    .replace(/([a-z0-9])([A-Z])/g, '$1 $2')
    .replace(/[_.]/g, ' ')
    .toLowerCase();
}
