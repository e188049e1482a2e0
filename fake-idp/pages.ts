import { DEMO_PASSWORD, demoAccounts } from './accounts.ts';

/** Every interpolated value goes through this: addresses and error text come straight from the request. */
export function escapeHtml(value: string): string {
  return value
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/"/g, '&quot;')
    .replace(/'/g, '&#39;');
}

// Colours were picked for at least 4.5:1 against their backgrounds (text) and 3:1 (borders, focus),
// so the pages pass an automated contrast check and stay readable on a dim workshop screen.
const STYLE = `
*{box-sizing:border-box}
html{font-size:100%}
body{margin:0;background:#fbf7f2;color:#2d241e;font-family:system-ui,sans-serif;line-height:1.5}
main{max-width:34rem;margin:0 auto;padding:2rem 1.25rem 3rem}
h1{font-size:1.75rem;margin:0 0 1.25rem}
h2{font-size:1.25rem;margin:2.5rem 0 .5rem}
p{margin:0 0 1rem}
label{display:block;font-weight:600;margin:1rem 0 .25rem}
input{display:block;width:100%;min-height:48px;padding:.625rem .75rem;font:inherit;color:#2d241e;background:#fff;border:2px solid #7a6a5d;border-radius:8px}
input:focus,button:focus,a:focus{outline:3px solid #8c3f1f;outline-offset:2px}
button,.button{display:inline-flex;align-items:center;justify-content:center;min-height:48px;min-width:44px;margin-top:1.5rem;padding:.625rem 1.5rem;font:inherit;font-weight:600;color:#fff;background:#8c3f1f;border:0;border-radius:8px;cursor:pointer;text-decoration:none}
button:hover,.button:hover{background:#6f3118}
a{color:#7a3519}
.secondary{display:inline-flex;align-items:center;min-height:44px;margin-left:1rem}
.alert{margin:0 0 1rem;padding:.75rem 1rem;color:#7f1d1d;background:#fdeeee;border:2px solid #b42318;border-radius:8px;font-weight:600}
table{width:100%;border-collapse:collapse;margin:.5rem 0 1rem}
th,td{text-align:left;padding:.5rem .5rem;border-bottom:1px solid #d9ccc0;vertical-align:top}
th{font-weight:600}
code{font-family:ui-monospace,monospace;background:#f1e8de;padding:.1rem .3rem;border-radius:4px}
.note{margin-top:2rem;font-size:.875rem;color:#5a4a3f}
`;

interface LayoutOptions {
  title: string;
  body: string;
  /** Only the sign-out page needs a script; its nonce matches this response's Content-Security-Policy. */
  script?: { nonce?: string; source: string };
}

export function layout({ title, body, script }: LayoutOptions): string {
  const scriptTag = script
    ? `<script${script.nonce ? ` nonce="${escapeHtml(script.nonce)}"` : ''}>${script.source}</script>`
    : '';
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="robots" content="noindex">
<title>${escapeHtml(title)}</title>
<style>${STYLE}</style>
</head>
<body>
<main>
${body}
<p class="note">Development identity provider — for local use only.</p>
</main>
${scriptTag}
</body>
</html>`;
}

interface SignInPageOptions {
  uid: string;
  email?: string;
  error?: string;
}

export function signInPage({ uid, email = '', error }: SignInPageOptions): string {
  const base = `/interaction/${encodeURIComponent(uid)}`;
  const alert = error ? `<div class="alert" role="alert">${escapeHtml(error)}</div>` : '';
  const rows = demoAccounts
    .map(
      (account) =>
        `<tr><td>${escapeHtml(account.email)}</td><td>${escapeHtml(account.description)}</td></tr>`,
    )
    .join('\n');

  return layout({
    title: error ? 'Sign in to Plinth (error)' : 'Sign in to Plinth',
    body: `<h1>Sign in to Plinth</h1>
${alert}
<form method="post" action="${escapeHtml(`${base}/login`)}">
<label for="email">Email</label>
<input id="email" name="email" type="email" autocomplete="username" required value="${escapeHtml(email)}"${email ? '' : ' autofocus'}>
<label for="password">Password</label>
<input id="password" name="password" type="password" autocomplete="current-password" required${email ? ' autofocus' : ''}>
<button type="submit">Sign in</button>
<a class="secondary" href="${escapeHtml(`${base}/abort`)}">Cancel</a>
</form>
<section aria-labelledby="demo-sign-ins">
<h2 id="demo-sign-ins">Demo sign-ins</h2>
<p>Every demo account uses the password <code>${escapeHtml(DEMO_PASSWORD)}</code>.</p>
<table>
<thead><tr><th scope="col">Email</th><th scope="col">Who they are</th></tr></thead>
<tbody>
${rows}
</tbody>
</table>
</section>`,
  });
}

export function messagePage(title: string, message: string): string {
  return layout({
    title,
    body: `<h1>${escapeHtml(title)}</h1>\n<p>${escapeHtml(message)}</p>`,
  });
}

export const EXPIRED_TITLE = 'Sign-in expired';
export const EXPIRED_MESSAGE =
  'This sign-in link has expired. Go back to Plinth and choose Sign in again.';
