import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { CreateWorkshopInput } from "@shared/schemas/workshop";
import { ApiError } from "@/lib/api-client";
import { authClient, unwrap } from "@/lib/auth-client";
import { getMeQueryOptions } from "@/lib/auth";

/** Creates a workshop; better-auth makes the creator its owner (creatorRole) and we make it active. */
export async function createWorkshop(input: CreateWorkshopInput) {
  const created = await unwrap(authClient.organization.create({ name: input.name, slug: input.slug }));
  if (!created) throw new ApiError(500, "internal", "The workshop was not created: the server gave no answer. Try again.");
  await unwrap(authClient.organization.setActive({ organizationId: created.id }));
  return created;
}

export function useCreateWorkshop() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createWorkshop,
    onSuccess: async () => {
      await queryClient.invalidateQueries();
      await queryClient.fetchQuery(getMeQueryOptions());
    },
  });
}
