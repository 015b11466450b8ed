/** The stand-in identity provider's own pages, in Ratewarden's colours and type. */
const escape = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);

function frame(title: string, body: string): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1">
<title>${escape(title)}</title><style>
@font-face{font-family:'Noto Sans';font-weight:400 700;src:url('/fonts/noto-sans.woff2') format('woff2')}
body{margin:0;font-family:'Noto Sans',system-ui,sans-serif;background:#f6f4ee;color:#1f3a3d}
header{background:#1f3a3d;color:#f6f4ee;padding:14px 24px;font-weight:600;letter-spacing:.02em}
main{max-width:420px;margin:48px auto;padding:24px 28px;background:#fff;border-left:4px solid #2e6b57}
h1{font-size:1.35rem;margin:0 0 4px} p{color:#4a6163;margin:0 0 18px;font-size:.95rem}
label{display:block;font-size:.85rem;font-weight:600;margin:14px 0 4px}
input{width:100%;box-sizing:border-box;padding:9px 10px;border:1px solid #b9c2bb;border-radius:2px;font:inherit}
input:focus,button:focus{outline:3px solid #b97a12;outline-offset:1px}
button{margin-top:20px;background:#2e6b57;color:#fff;border:0;border-radius:2px;padding:10px 18px;font:inherit;font-weight:600;cursor:pointer}
.error{background:#f7e3de;border-left:4px solid #a23b2a;padding:8px 10px;color:#a23b2a;font-size:.9rem}
small{display:block;margin-top:18px;color:#4a6163}
</style></head><body><header>Kestrelmoor identity service <span style="opacity:.7;font-weight:400">· local stand-in</span></header>
<main>${body}</main></body></html>`;
}

export function signInPage(uid: string, clientName: string, error?: string, email = ''): string {
  return frame(
    'Sign in',
    `<h1>Sign in</h1><p>to continue to ${escape(clientName)}</p>
${error ? `<div class="error" role="alert">${escape(error)}</div>` : ''}
<form method="post" action="/interaction/${escape(uid)}/login" autocomplete="off">
<label for="email">Work e-mail</label><input id="email" name="email" type="email" required autofocus value="${escape(email)}">
<label for="password">Password</label><input id="password" name="password" type="password" required>
<button type="submit">Sign in</button></form>
<small>Demo accounts use the password <code>demo-password</code>.</small>`,
  );
}

/** The answer to a sign-in attempt past the limit of failed ones (HTTP 429). */
export function tooManyAttemptsPage(what: string, minutes: number): string {
  return frame(
    'Too many attempts',
    `<h1>Too many attempts</h1><div class="error" role="alert">Too many wrong passwords ${escape(what)}. Sign-in is locked for up to ${minutes} minutes; try again later.</div>`,
  );
}

/** RP-initiated logout: the provider's confirmation form, submitted at once (the user already chose to sign out). */
export function signOutPage(form: string): string {
  return frame(
    'Signing out',
    `<h1>Signing out…</h1><p>You are being signed out of the identity service.</p>${form}
<noscript><button form="op.logoutForm" type="submit" name="logout" value="yes">Sign out</button></noscript>
<script>document.forms[0].insertAdjacentHTML('beforeend','<input type="hidden" name="logout" value="yes">');document.forms[0].submit();</script>`,
  );
}

export function signedOutPage(): string {
  return frame('Signed out', '<h1>Signed out</h1><p>You have been signed out of the identity service.</p>');
}
