/**
 * Every client route, defined once: `pattern` is what the router matches, `href()` builds a link.
 * Screens never write a path literal, so renaming a route is a one-line change.
 */

/** Only same-site paths may be used as a return address (mirrors the server's check). */
export function safeReturnTo(value: string | null | undefined): string {
  if (!value || value.length > 500 || !/^\/(?!\/)[^\s]*$/.test(value)) return '/';
  // Never bounce back to the public pages themselves, nor to the lent tablet's screen.
  if (value.startsWith('/signin') || value.startsWith('/no-access') || value.startsWith('/tablet')) return '/';
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
  audit: { pattern: '/audit', href: () => '/audit' },
  /** Where the audit log was when only the administrator read it: redirects to `audit`. */
  oldAudit: { pattern: '/admin/audit', href: () => '/admin/audit' },

  performers: {
    pattern: '/performers',
    href: (search: { consent?: string; q?: string } = {}) => withSearch('/performers', { consent: search.consent, q: search.q }),
  },
  newPerformer: { pattern: '/performers/new', href: () => '/performers/new' },
  importPerformers: { pattern: '/performers/import', href: () => '/performers/import' },
  performer: { pattern: '/performers/:id', href: (id: string) => `/performers/${encodeURIComponent(id)}` },
  editPerformer: { pattern: '/performers/:id/edit', href: (id: string) => `/performers/${encodeURIComponent(id)}/edit` },
  consent: { pattern: '/consents/:id', href: (id: string) => `/consents/${encodeURIComponent(id)}` },
  consentForms: { pattern: '/consent-forms', href: () => '/consent-forms' },
  newConsentForm: { pattern: '/consent-forms/new', href: () => '/consent-forms/new' },
  consentForm: { pattern: '/consent-forms/:id', href: (id: string) => `/consent-forms/${encodeURIComponent(id)}` },
  bookings: { pattern: '/bookings', href: () => '/bookings' },

  /** The life-cast archive: Find, one cast, the store's places, a scanned label, retention. */
  archive: {
    pattern: '/archive',
    href: (search: { q?: string; overdue?: 'true' } = {}) => withSearch('/archive', { q: search.q, overdue: search.overdue }),
  },
  newCast: { pattern: '/archive/casts/new', href: (performerId?: string) => withSearch('/archive/casts/new', { performerId }) },
  cast: { pattern: '/archive/casts/:id', href: (id: string) => `/archive/casts/${encodeURIComponent(id)}` },
  editCast: { pattern: '/archive/casts/:id/edit', href: (id: string) => `/archive/casts/${encodeURIComponent(id)}/edit` },
  places: { pattern: '/archive/places', href: () => '/archive/places' },
  place: { pattern: '/archive/places/:id', href: (id: string) => `/archive/places/${encodeURIComponent(id)}` },
  /** What a label's QR opens: the label code, resolved to its cast or place. */
  label: { pattern: '/archive/labels/:code', href: (code: string) => `/archive/labels/${encodeURIComponent(code)}` },
  retention: { pattern: '/archive/retention', href: () => '/archive/retention' },
  verify: { pattern: '/verify', href: () => '/verify' },
  /** Withdrawals since you last looked and, for the lead, health answers to look at. */
  consentWorklist: { pattern: '/consents/worklist', href: () => '/consents/worklist' },
  catalogue: { pattern: '/catalogue', href: () => '/catalogue' },
  newProduct: { pattern: '/catalogue/new', href: () => '/catalogue/new' },
  product: { pattern: '/catalogue/:id', href: (id: string) => `/catalogue/${encodeURIComponent(id)}` },
  editProduct: { pattern: '/catalogue/:id/edit', href: (id: string) => `/catalogue/${encodeURIComponent(id)}/edit` },
  ingredients: { pattern: '/ingredients', href: (search: { q?: string } = {}) => withSearch('/ingredients', { q: search.q }) },
  protocols: { pattern: '/protocols', href: () => '/protocols' },

  /** Appliance builds of the seat's production, their pieces, and the workshop calculators. */
  builds: { pattern: '/builds', href: () => '/builds' },
  newBuild: { pattern: '/builds/new', href: (moldId?: string) => withSearch('/builds/new', { moldId }) },
  build: { pattern: '/builds/:id', href: (id: string) => `/builds/${encodeURIComponent(id)}` },
  editBuild: { pattern: '/builds/:id/edit', href: (id: string) => `/builds/${encodeURIComponent(id)}/edit` },
  mixCalculator: { pattern: '/calculators/mix', href: () => '/calculators/mix' },
  moldBoxCalculator: { pattern: '/calculators/mold-box', href: () => '/calculators/mold-box' },
  protocol: { pattern: '/protocols/:id', href: (id: string) => `/protocols/${encodeURIComponent(id)}` },

  /** Patch tests: booking one for a performer, and one test with its schedule and reading grid. */
  bookPatchTest: { pattern: '/patch-tests/new', href: (performerId?: string) => withSearch('/patch-tests/new', { performerId }) },
  patchTest: { pattern: '/patch-tests/:id', href: (id: string) => `/patch-tests/${encodeURIComponent(id)}` },
  /** The artist's check before an application, kits, the application log, requests to the lead, incidents and lot trace. */
  check: { pattern: '/check', href: (search: { performerId?: string; checkId?: string } = {}) => withSearch('/check', search) },
  kits: { pattern: '/kits', href: () => '/kits' },
  application: { pattern: '/applications/:id', href: (id: string) => `/applications/${encodeURIComponent(id)}` },
  leadRequest: { pattern: '/requests/:id', href: (id: string) => `/requests/${encodeURIComponent(id)}` },
  incident: { pattern: '/incidents/:id', href: (id: string) => `/incidents/${encodeURIComponent(id)}` },
  lotTrace: { pattern: '/lots/:id/trace', href: (id: string) => `/lots/${encodeURIComponent(id)}/trace` },

  // Public pages, outside the signed-in shell.
  /** The department's tablet while it is lent to a performer. */
  tablet: { pattern: '/tablet', href: () => '/tablet' },
  signLink: { pattern: '/sign/:token', href: (token: string) => `/sign/${encodeURIComponent(token)}` },
  /** One e-mailed link that walks through several forms in order. */
  signBundle: { pattern: '/sign/bundle/:token', href: (token: string) => `/sign/bundle/${encodeURIComponent(token)}` },
  withdrawRequest: { pattern: '/withdraw', href: () => '/withdraw' },
  withdrawLink: { pattern: '/withdraw/:token', href: (token: string) => `/withdraw/${encodeURIComponent(token)}` },
  /** The performer confirms the address staff entered is theirs. */
  confirmEmail: { pattern: '/confirm-email/:token', href: (token: string) => `/confirm-email/${encodeURIComponent(token)}` },
  /** The performer accepts an invitation to link a sign-in of their own (signed in, but maybe with no role yet). */
  join: { pattern: '/join/:token', href: (token: string) => `/join/${encodeURIComponent(token)}` },
} as const;

/** Server addresses reached by full page navigation rather than fetch. */
export const serverPaths = {
  /** Starts sign-in at the identity provider; the server brings the person back to returnTo. */
  login: (returnTo = '/') => `/api/auth/login?${new URLSearchParams({ returnTo: safeReturnTo(returnTo) }).toString()}`,
  /**
   * Leaving the tablet's hand-back screen: the identity provider must ask for the password again
   * (the server forces it while the session is lent), then staff land on the performer list.
   */
  reauth: (returnTo = '/performers') =>
    `/api/auth/login?${new URLSearchParams({ reauth: 'true', returnTo: safeReturnTo(returnTo) }).toString()}`,
  /** The filtered registry as CSV, downloaded by the browser. */
  performersCsv: (query: Record<string, string | undefined>) => withSearch('/api/performers/export.csv', query),
  consentPdf: (id: string) => `/api/consents/${encodeURIComponent(id)}/pdf`,
  consentStaffPdf: (id: string) => `/api/consents/${encodeURIComponent(id)}/staff-pdf`,
  /** The performer's printable card with the QR code the check scans. */
  performerCard: (id: string, format: 'pdf' | 'png') => `/api/performers/${encodeURIComponent(id)}/card.${format}`,
  /** A catalogue product's safety data sheet, downloaded by the browser. */
  safetySheet: (productId: string) => `/api/products/${encodeURIComponent(productId)}/safety-data-sheet`,
  /** A printable sheet of QR labels for these casts and places. */
  labelSheet: (ids: { casts?: readonly string[]; locations?: readonly string[] }) =>
    withSearch('/api/archive/labels.pdf', { casts: ids.casts?.join(','), locations: ids.locations?.join(',') }),
} as const;
