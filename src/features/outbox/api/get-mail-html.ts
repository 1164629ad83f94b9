import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";

export function getMailHtml(messageId: string) {
  return api.getText(`/api/mail/${encodeURIComponent(messageId)}/html`);
}

export const getMailHtmlQueryOptions = (workshopId: string, messageId: string) =>
  queryOptions({ queryKey: ["workshops", workshopId, "mail", messageId, "html"], queryFn: () => getMailHtml(messageId) });

export function useMailHtml(workshopId: string, messageId: string, enabled: boolean) {
  return useQuery({ ...getMailHtmlQueryOptions(workshopId, messageId), enabled });
}
