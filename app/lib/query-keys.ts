import type { QueryClient } from '@tanstack/react-query';
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
export const performersKey = ['performers'] as const;
export const consentsKey = ['consents'] as const;
export const templatesKey = ['consent-templates'] as const;
export const signingRequestsKey = ['signing-requests'] as const;
export const bookingsKey = ['bookings'] as const;
export const productsKey = ['products'] as const;
export const ingredientsKey = ['ingredients'] as const;
export const protocolsKey = ['protocols'] as const;
export const buildsKey = ['appliance-builds'] as const;
export const kitsKey = ['kits'] as const;
export const checksKey = ['checks'] as const;
export const applicationsKey = ['applications'] as const;
export const leadRequestsKey = ['lead-requests'] as const;
export const incidentsKey = ['incidents'] as const;
/** Public signing and withdrawal screens: never mixed with a signed-in person's data. */
export const tabletKey = ['tablet'] as const;
export const signingLinkKey = ['signing-link'] as const;
export const withdrawalLinkKey = ['withdrawal-link'] as const;
export const identityLinkKey = ['identity-link'] as const;

/** Marks every query under these keys stale (and refetches those on screen): the one way a write says what it changed. */
export function invalidate(queryClient: QueryClient, keys: readonly (readonly unknown[])[]): Promise<unknown> {
  return Promise.all(keys.map((queryKey) => queryClient.invalidateQueries({ queryKey })));
}
export const archiveKey = ['archive'] as const;
export const patchTestsKey = ['patch-tests'] as const;
