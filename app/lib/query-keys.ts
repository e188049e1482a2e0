/**
 * Roots of the query keys. Each `<noun>QueryOptions` factory owns its full key; these roots
 * exist so a mutation can invalidate a whole family (every page of users, say) in one call.
 */
export const sessionKey = ['session'] as const;
export const homeKey = ['home'] as const;
export const usersKey = ['users'] as const;
export const productionsKey = ['productions'] as const;
export const outboxKey = ['outbox'] as const;
export const auditKey = ['audit'] as const;
