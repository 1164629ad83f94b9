import { queryOptions, useQuery } from "@tanstack/react-query";
import { api } from "@/lib/api-client";

export type MailAttachment = { index: number; filename: string; contentType: string; size: number; sha256: string };
export type MailMessage = {
  id: string;
  from: string;
  to: string[];
  subject: string;
  date: string;
  text: string;
  html: string | null;
  attachments: MailAttachment[];
};

export async function getMail(): Promise<MailMessage[]> {
  return (await api.get<{ messages: MailMessage[] }>("/api/mail")).messages;
}

/** The outbox belongs to the active workshop, so its key carries the workshop id. */
export const getMailQueryOptions = (workshopId: string) => queryOptions({ queryKey: ["workshops", workshopId, "mail"], queryFn: getMail });

export function useMail(workshopId: string) {
  return useQuery(getMailQueryOptions(workshopId));
}

/** One message, read from the same cached list (the contract has no single-message route). */
export function useMailMessage(workshopId: string, id: string) {
  return useQuery({ ...getMailQueryOptions(workshopId), select: (messages) => messages.find((message) => message.id === id) ?? null });
}

export const mailAttachmentHref = (messageId: string, index: number) =>
  `/api/mail/${encodeURIComponent(messageId)}/attachments/${index}`;
