import type { OutboxItem } from '@/lib/outbox';
import type { VisitBody } from '@shared/schemas/visits';

/**
 * When the home's fan was last switched on: from the visits on the server and from visits still
 * waiting on this device (a post-mitigation test is often recorded before the visit went out).
 */
export function latestActivation(serverVisits: readonly { fanActivatedAt: string | null }[], waiting: readonly OutboxItem[], homeId: string): string | null {
  const times = [
    ...serverVisits.map((v) => v.fanActivatedAt),
    ...waiting.filter((i) => i.kind === 'visit' && i.homeId === homeId).map((i) => (i.request.json as VisitBody | undefined)?.fanActivatedAt ?? null),
  ].filter((t): t is string => Boolean(t) && !Number.isNaN(Date.parse(t!)));
  if (times.length === 0) return null;
  return times.reduce((a, b) => (Date.parse(b) > Date.parse(a) ? b : a));
}
