import type { OutboxRequest } from '@/lib/outbox';
import type { ATTACHMENT_KINDS, PHOTO_SUBJECTS } from '@shared/schemas/visits';

export type AttachmentKind = (typeof ATTACHMENT_KINDS)[number];
export type PhotoSubject = (typeof PHOTO_SUBJECTS)[number];

export interface AttachmentInput {
  homeId: string;
  /** Generated on the device: sending the same file again stores it once. */
  attachmentId: string;
  kind: AttachmentKind;
  subject?: PhotoSubject;
  visitId?: string;
  radonTestId?: string;
  file: Blob;
  name: string;
}

/**
 * PUT /api/homes/:homeId/attachments/:attachmentId — the file's bytes as the body, its type as the
 * Content-Type, what it belongs to in the query. Sent by the outbox (it may wait for a connection).
 */
export function attachmentRequest(input: AttachmentInput): OutboxRequest {
  const query = new URLSearchParams({ kind: input.kind, name: input.name });
  if (input.subject) query.set('subject', input.subject);
  if (input.visitId) query.set('visitId', input.visitId);
  if (input.radonTestId) query.set('radonTestId', input.radonTestId);
  return {
    method: 'PUT',
    url: `/api/homes/${input.homeId}/attachments/${input.attachmentId}?${query}`,
    blob: input.file,
    contentType: input.file.type,
  };
}
