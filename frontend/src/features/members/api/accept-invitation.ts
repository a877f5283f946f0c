import { useMutation } from '@tanstack/react-query';
import type { AcceptInvitationRequest, LoginResponse } from '@dialsheet/common';
import { api } from '@/lib/api-client';
import { useStartSession } from '@/lib/auth';
import type { MutationConfig } from '@/lib/query-client';

// The form shows a wrong password or an expired link inline.
export const acceptInvitation = (data: AcceptInvitationRequest): Promise<LoginResponse> =>
  api.post<LoginResponse>('/invitations/accept', data, { notify: false });

/** Accepting signs the invitee in (as the invited account), replacing any session in this browser. */
export function useAcceptInvitation({
  mutationConfig,
}: { mutationConfig?: MutationConfig<typeof acceptInvitation> } = {}) {
  const startSession = useStartSession();
  const { onSuccess, ...rest } = mutationConfig ?? {};
  return useMutation({
    ...rest,
    mutationFn: acceptInvitation,
    onSuccess: (...args) => {
      startSession(args[0]);
      return onSuccess?.(...args);
    },
  });
}
