import { useState } from 'react';
import { paths } from '../../config/paths';
import { csrfHeaders } from '../../lib/api-client';

/** Sign-out is a POST carrying the CSRF token; afterwards the whole app restarts signed out. */
export function SignOutButton() {
  const [busy, setBusy] = useState(false);
  const [failed, setFailed] = useState(false);
  async function signOut() {
    setBusy(true);
    setFailed(false);
    try {
      const res = await fetch(paths.signOut, { method: 'POST', credentials: 'same-origin', headers: csrfHeaders('POST'), redirect: 'manual' });
      if (res.status >= 400) throw new Error(String(res.status));
      window.location.assign(paths.home);
    } catch {
      setFailed(true);
      setBusy(false);
    }
  }
  return (
    <span className="flex items-center gap-2">
      <button type="button" onClick={signOut} disabled={busy} className="rounded-sm border border-paper/40 px-3 py-1 text-sm hover:bg-paper hover:text-ink disabled:opacity-60">
        {busy ? 'Signing out …' : 'Sign out'}
      </button>
      {failed && <span role="alert" className="text-xs text-amber-soft">Sign-out failed; try again.</span>}
    </span>
  );
}
