/**
 * Who is signed in and in which workshop (GET /api/me), plus sign-in, sign-up and sign-out.
 * `me` is `null` when nobody is signed in: loaders redirect on it, pages branch on it.
 */
import { queryOptions, useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import type { RoleName } from "@shared/permissions";
import type { SignInInput, SignUpInput } from "@shared/schemas/account";
import { paths } from "@/config/paths";
import { api, isApiError } from "./api-client";
import { authClient, unwrap } from "./auth-client";

export type WorkshopMembership = { id: string; name: string; slug: string; role: RoleName };
export type Me = {
  user: { id: string; name: string; email: string };
  workshops: WorkshopMembership[];
  activeWorkshop: WorkshopMembership | null;
};

/** Who is signed in, or null: the server answers `{ user: null }` (not a 401) when nobody is. */
export async function getMe(): Promise<Me | null> {
  try {
    const me = await api.get<Me | { user: null }>("/api/me");
    return me.user ? (me as Me) : null;
  } catch (error) {
    if (isApiError(error) && error.status === 401) return null;
    throw error;
  }
}

export const meQueryKey = ["me"] as const;
export const getMeQueryOptions = () => queryOptions({ queryKey: meQueryKey, queryFn: getMe });

export function useMe() {
  return useQuery(getMeQueryOptions());
}

/** `next`: where a fresh confirmation link (sent when the address is not confirmed yet) should lead. */
export function signIn(input: SignInInput & { next?: string | null }) {
  return unwrap(authClient.signIn.email({ email: input.email, password: input.password, callbackURL: paths.auth.emailConfirmed.getHref(input.next) }));
}

/** Creates the account; nobody is signed in until the address is confirmed through the mailed link. */
export function signUp(input: SignUpInput & { next?: string | null }) {
  return unwrap(authClient.signUp.email({ name: input.name, email: input.email, password: input.password, callbackURL: paths.auth.emailConfirmed.getHref(input.next) }));
}

/** Sends the confirmation link again (the answer is the same whether or not the address has an account). */
export function resendConfirmation(email: string, next?: string | null) {
  return unwrap(authClient.sendVerificationEmail({ email, callbackURL: paths.auth.emailConfirmed.getHref(next) }));
}

/** Mails a reset link if the address has an account; the answer is the same either way. */
export function requestPasswordReset(email: string) {
  return unwrap(authClient.requestPasswordReset({ email, redirectTo: paths.auth.resetPassword.getHref() }));
}

export function resetPassword(token: string, password: string) {
  return unwrap(authClient.resetPassword({ token, newPassword: password }));
}

/**
 * A new identity means every cached answer may belong to someone else: drop them all, except the
 * public invitation details (the same for anyone holding the link), which the invitation page shows.
 */
function useResetAfterIdentityChange() {
  const queryClient = useQueryClient();
  return async () => {
    const me = await getMe();
    // removeQueries does not tell mounted observers, so `me` is replaced with setQueryData, which does.
    queryClient.removeQueries({ predicate: (query) => query.queryKey[0] !== "invitations" && query.queryKey[0] !== meQueryKey[0] });
    queryClient.setQueryData(meQueryKey, me);
  };
}

export function useSignIn() {
  const reset = useResetAfterIdentityChange();
  return useMutation({ mutationFn: signIn, onSuccess: reset });
}

export function useSignUp() {
  return useMutation({ mutationFn: signUp });
}

/**
 * Signs out, then loads `nextHref` afresh: a full page load is the surest way to leave nothing of
 * the previous person's data in memory (query cache, form state, router data).
 */
export function useSignOut() {
  return useMutation({
    mutationFn: async (nextHref: string) => {
      await unwrap(authClient.signOut());
      return nextHref;
    },
    onSuccess: (nextHref) => window.location.replace(nextHref),
  });
}
