import { useState } from 'react';
import { paths } from '../../config/paths';
import { useSession } from '../../api/get-session';

/**
 * Sign-out is a form POST carrying the CSRF token, so the browser follows the server's redirect to
 * the identity provider's end-session page and back: both sessions end, not only Ratewarden's.
 */
export function SignOutButton() {
  const [busy, setBusy] = useState(false);
  const session = useSession();
  return (
    <form method="post" action={paths.signOut} onSubmit={() => setBusy(true)}>
      <input type="hidden" name="_csrf" value={session.data?.csrfToken ?? ''} />
      <button type="submit" disabled={busy} className="btn btn-quiet px-3 py-1 text-sm">
        {busy ? 'Signing out …' : 'Sign out'}
      </button>
    </form>
  );
}
