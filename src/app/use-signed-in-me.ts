import { useMe } from "@/lib/auth";
import { ApiError } from "@/lib/api-client";
import type { SignedInMe } from "./loaders";

/**
 * Inside /app the loader has already made sure someone is signed in with an active workshop.
 * If the session ends meanwhile (signed out in another tab), the error element sends them to sign in.
 */
export function useSignedInMe(): SignedInMe {
  const { data } = useMe();
  if (!data) throw new ApiError(401, "unauthenticated", "Your session has ended. Sign in again.");
  if (!data.activeWorkshop) throw new ApiError(403, "forbidden", "Choose or create a workshop first.");
  return data as SignedInMe;
}
