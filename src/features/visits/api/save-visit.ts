import { useMutation } from '@tanstack/react-query';
import { enqueue, type NewOutboxItem, type OutboxRequest } from '@/lib/outbox';
import type { VisitBody } from '@shared/schemas/visits';
import { attachmentRequest, type PhotoSubject } from './upload-attachment';

/** POST /api/homes/:homeId/visits — 201 for a new visit, 200 when the same id was sent before. */
export function visitRequest(homeId: string, visit: VisitBody): OutboxRequest {
  return { method: 'POST', url: `/api/homes/${homeId}/visits`, json: visit };
}

export interface QueueVisitInput {
  homeId: string;
  /** Shown if the server refuses the visit, e.g. the address. */
  homeLabel: string;
  visit: VisitBody;
  photos: { id: string; file: File; subject: PhotoSubject }[];
}

const SUBJECT_LABEL: Record<PhotoSubject, string> = { manometer: 'manometer', fan: 'fan', suction_point: 'suction point', other: 'other' };

/**
 * Keeps the visit and its photos on the device and sends them when there is a connection: the visit
 * first, each photo after it. Resolves once everything is stored on the device, not when it is sent.
 */
export async function queueVisit({ homeId, homeLabel, visit, photos }: QueueVisitInput): Promise<void> {
  const items: NewOutboxItem[] = [
    { id: visit.id, kind: 'visit', homeId, label: `Visit of ${visit.visitedOn} at ${homeLabel}`, request: visitRequest(homeId, visit) },
    ...photos.map((p) => ({
      id: p.id,
      kind: 'photo',
      homeId,
      after: visit.id,
      label: `Photo (${SUBJECT_LABEL[p.subject]}) for the visit of ${visit.visitedOn} at ${homeLabel}`,
      request: attachmentRequest({ homeId, attachmentId: p.id, kind: 'photo', subject: p.subject, visitId: visit.id, file: p.file, name: p.file.name }),
    })),
  ];
  await enqueue(items);
}

export function useQueueVisit() {
  // 'always': saving to the device must work with no connection (TanStack pauses 'online' mutations).
  return useMutation({ mutationFn: queueVisit, networkMode: 'always' });
}
