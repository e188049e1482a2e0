/**
 * Every client route, defined once: `pattern` is what the router matches, `href()` builds a link.
 * Screens never write a path literal, so renaming a route is a one-line change.
 */

/** Only same-site paths may be used as a return address (mirrors the server's check). */
export function safeReturnTo(value: string | null | undefined): string {
  if (!value || value.length > 500 || !/^\/(?!\/)[^\s]*$/.test(value)) return '/';
  // Never bounce back to the public pages themselves.
  if (value.startsWith('/signin') || value.startsWith('/no-access')) return '/';
  return value;
}

function withSearch(path: string, search: Record<string, string | undefined>): string {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(search)) if (v) params.set(k, v);
  const qs = params.toString();
  return qs ? `${path}?${qs}` : path;
}

export const paths = {
  signIn: {
    pattern: '/signin',
    href: (returnTo?: string) => withSearch('/signin', { returnTo: returnTo && returnTo !== '/' ? returnTo : undefined }),
  },
  noAccess: { pattern: '/no-access', href: () => '/no-access' },
  home: { pattern: '/', href: () => '/' },
  users: {
    pattern: '/admin/users',
    href: (search: { access?: 'none' } = {}) => withSearch('/admin/users', { access: search.access }),
  },
  productions: { pattern: '/admin/productions', href: () => '/admin/productions' },
  production: {
    pattern: '/admin/productions/:id',
    href: (id: string) => `/admin/productions/${encodeURIComponent(id)}`,
  },
  outbox: { pattern: '/admin/outbox', href: () => '/admin/outbox' },
  audit: { pattern: '/admin/audit', href: () => '/admin/audit' },
} as const;

/** Server addresses reached by full page navigation rather than fetch. */
export const serverPaths = {
  /** Starts sign-in at the identity provider; the server brings the person back to returnTo. */
  login: (returnTo = '/') => `/api/auth/login?${new URLSearchParams({ returnTo: safeReturnTo(returnTo) }).toString()}`,
  outboxMessage: (id: string) => `/api/outbox/${encodeURIComponent(id)}`,
} as const;
