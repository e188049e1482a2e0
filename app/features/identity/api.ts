import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { AccountInvitationAcceptedSchema, AccountInvitationViewSchema, EmailConfirmationViewSchema } from '#shared/schemas/identity.ts';
import { api } from '../../lib/api-client.ts';
import { identityLinkKey, invalidate, sessionKey } from '../../lib/query-keys.ts';

const tokenPath = (base: string, token: string, rest = '') => `${base}/${encodeURIComponent(token)}${rest}`;

export function emailConfirmationQueryOptions(token: string) {
  return queryOptions({
    queryKey: [...identityLinkKey, 'confirm', token] as const,
    queryFn: ({ signal }) => api.get(tokenPath('/api/email-confirmations', token), EmailConfirmationViewSchema, signal),
    retry: false,
  });
}

export function useConfirmEmail(token: string) {
  return useMutation({ mutationFn: () => api.post(tokenPath('/api/email-confirmations', token), {}, EmailConfirmationViewSchema) });
}

export function invitationQueryOptions(token: string) {
  return queryOptions({
    queryKey: [...identityLinkKey, 'invitation', token] as const,
    queryFn: ({ signal }) => api.get(tokenPath('/api/account-invitations', token), AccountInvitationViewSchema, signal),
    retry: false,
  });
}

export function useAcceptInvitation(token: string) {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: () => api.post(tokenPath('/api/account-invitations', token, '/accept'), {}, AccountInvitationAcceptedSchema),
    // The person now holds the performer role: their seats change.
    onSuccess: () => invalidate(queryClient, [sessionKey]),
  });
}
