import { useMutation } from '@tanstack/react-query';
import { enqueue, type NewOutboxItem, type OutboxRequest } from '@/lib/outbox';
import type { RadonTestBody } from '@shared/schemas/visits';
import { attachmentRequest } from './upload-attachment';

/** POST /api/homes/:homeId/radon-tests — 201 for a new test, 200 when the same id was sent before. */
export function radonTestRequest(homeId: string, test: RadonTestBody): OutboxRequest {
  return { method: 'POST', url: `/api/homes/${homeId}/radon-tests`, json: test };
}

export interface QueueRadonTestInput {
  homeId: string;
  homeLabel: string;
  test: RadonTestBody;
  labReport: { id: string; file: File } | null;
}

/** Keeps the test (and its lab report) on the device until sent, like a visit. */
export async function queueRadonTest({ homeId, homeLabel, test, labReport }: QueueRadonTestInput): Promise<void> {
  const kind = test.kind === 'pre' ? 'Pre-mitigation' : 'Post-mitigation';
  const items: NewOutboxItem[] = [
    { id: test.id, kind: 'radon_test', homeId, label: `${kind} test ending ${test.endedAt.slice(0, 10)} at ${homeLabel}`, request: radonTestRequest(homeId, test) },
  ];
  if (labReport) {
    items.push({
      id: labReport.id,
      kind: 'lab_report',
      homeId,
      after: test.id,
      label: `Lab report for the ${kind.toLowerCase()} test at ${homeLabel}`,
      request: attachmentRequest({ homeId, attachmentId: labReport.id, kind: 'lab_report', radonTestId: test.id, file: labReport.file, name: labReport.file.name }),
    });
  }
  await enqueue(items);
}

export function useQueueRadonTest() {
  return useMutation({ mutationFn: queueRadonTest, networkMode: 'always' });
}
