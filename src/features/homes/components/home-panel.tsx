import { useHome } from '../api/get-home';
import { OutcomeBadge } from './outcome-badge';
import { ErrorNote } from '@/components/ui/error-note';
import { Caution } from '@/components/ui/caution';
import { formatRadon, paToInWc, type RadonDisplayUnit } from '@shared/domain/units';

const PASSIVE_LABEL = { yes: 'Passive system present', no: 'No passive system', unknown: 'Passive system unknown' } as const;
const FOUNDATION_LABEL = { slab: 'Slab-on-grade', basement: 'Basement', crawlspace: 'Crawlspace', mixed: 'Mixed foundation' } as const;
const SUB_SLAB_LABEL: Record<string, string> = { clean_gravel: 'clean gravel', mixed: 'mixed fill', none: 'no gravel', unknown: 'sub-slab not seen' };
const PHOTO_SUBJECT_LABEL: Record<string, string> = { manometer: 'manometer', fan: 'fan', suction_point: 'suction point' };
const REWORK_LABEL: Record<string, string> = {
  added_suction_point: 'added suction point',
  sealed_opening: 'sealed opening',
  sealed_joint: 'sealed slab joint or crack',
  rerouted_pipe: 're-routed pipe',
  larger_fan: 'larger fan',
  other: 'other',
};

function Row({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <div className="flex justify-between gap-3 border-b border-rule/60 py-1.5">
      <dt className="text-muted">{label}</dt>
      <dd className="text-right">{children}</dd>
    </div>
  );
}

/** Everything known about one home, with the actions the signed-in role may take. */
export function HomePanel({
  homeId,
  radonUnit,
  actionLevelBqM3,
  onClose,
  actions,
}: {
  homeId: string;
  radonUnit: RadonDisplayUnit;
  actionLevelBqM3: number;
  onClose(): void;
  actions?: React.ReactNode;
}) {
  const { data, error, isPending } = useHome(homeId);
  return (
    <article aria-label="Selected home" className="flex flex-col gap-3">
      <div className="flex items-start gap-2">
        <div className="min-w-0 flex-1">
          {data && (
            <>
              <h2 className="text-lg font-semibold" data-testid="home-address">{data.home.address}</h2>
              <p className="text-sm text-muted">{data.home.city}, {data.home.state} {data.home.zip}</p>
            </>
          )}
          {isPending && <p className="text-muted">Loading home…</p>}
        </div>
        <button onClick={onClose} aria-label="Close home panel" className="min-h-11 min-w-11 rounded-md border border-rule text-lg">×</button>
      </div>
      {error && <ErrorNote error={error} />}
      {data && (
        <>
          <OutcomeBadge outcome={data.home.outcome} />
          {data.planned && (
            <p data-testid="sample-this-home" className="flex items-center gap-2 rounded-md border border-state-planned/50 bg-state-planned/5 p-2 text-sm font-medium text-state-planned">
              <span aria-hidden className="inline-block h-3.5 w-3.5 rounded-full border-2 border-dashed border-state-planned" />
              Sample this home: it is in the community's sampling plan.
            </p>
          )}
          {actions && <div className="flex flex-wrap gap-2">{actions}</div>}
          <dl className="text-sm tabular">
            <Row label="Community">{data.home.communityName ?? '—'}</Row>
            <Row label="Builder">{data.home.builderName ?? '—'}</Row>
            <Row label="Built">{data.home.yearBuilt ?? '—'}</Row>
            <Row label="Foundation">{data.home.foundation ? FOUNDATION_LABEL[data.home.foundation] : '—'}</Row>
            <Row label="Passive system">{PASSIVE_LABEL[data.home.passiveSystem]}{data.home.pipeSizeIn ? `, ${data.home.pipeSizeIn}" pipe` : ''}</Row>
            {data.home.suctionPointNote && <Row label="Suction point">{data.home.suctionPointNote}</Row>}
            {data.home.contact && <Row label="Owner">{data.home.contact.ownerName || '—'}</Row>}
            {data.home.doNotContact && <Row label="Contact">Do not contact</Row>}
          </dl>
          <section>
            <h3 className="mb-1 font-medium">Visits</h3>
            {data.visits.length === 0 && <p className="text-sm text-muted">No visit recorded yet.</p>}
            <ul className="flex flex-col gap-2 text-sm tabular">
              {data.visits.map((v) => (
                <li key={v.id} className="rounded-md border border-rule p-2">
                  <p className="font-medium">{v.visitedOn} · {v.status === 'completed' ? 'Activation' : v.status === 'declined' ? 'Declined' : 'No access'}</p>
                  {v.vacuumPa != null && <p>Manometer {paToInWc(v.vacuumPa).toFixed(2)} in. WC · {SUB_SLAB_LABEL[v.subSlabMaterial]}</p>}
                  {(v.reworkNeeded || v.reworkDone) && (
                    <p className="text-state-bad">
                      Rework {v.reworkDone ? 'done' : 'needed'}{v.reworkReasons.length ? `: ${v.reworkReasons.map((r) => REWORK_LABEL[r] ?? r).join(', ')}` : ''}
                    </p>
                  )}
                  {v.notes && <p className="text-muted">{v.notes}</p>}
                  {(v.attachments ?? []).some((a) => a.kind === 'photo') && (
                    <ul className="mt-1 flex flex-wrap gap-1.5" aria-label="Photos">
                      {(v.attachments ?? [])
                        .filter((a) => a.kind === 'photo')
                        .map((a) => (
                          <li key={a.id}>
                            <a href={`/api/attachments/${a.id}`} target="_blank" rel="noreferrer">
                              <img
                                src={`/api/attachments/${a.id}/thumbnail`}
                                alt={PHOTO_SUBJECT_LABEL[a.subject ?? ''] ? `Photo of the ${PHOTO_SUBJECT_LABEL[a.subject ?? '']}` : 'Visit photo'}
                                loading="lazy"
                                className="h-14 w-14 rounded border border-rule object-cover"
                              />
                            </a>
                          </li>
                        ))}
                    </ul>
                  )}
                </li>
              ))}
            </ul>
          </section>
          <section>
            <h3 className="mb-1 font-medium">Radon tests</h3>
            {data.tests.length === 0 && <p className="text-sm text-muted">No test recorded yet.</p>}
            <ul className="flex flex-col gap-1 text-sm tabular">
              {data.tests.map((t) => (
                <li key={t.id} className="flex justify-between gap-2">
                  <span>{t.kind === 'pre' ? 'Pre-mitigation' : 'Post-mitigation'} · {t.endedAt.slice(0, 10)}</span>
                  <span className="flex gap-2">
                    {t.attachments?.filter((a) => a.kind === 'lab_report').map((a) => (
                      <a key={a.id} href={`/api/attachments/${a.id}`} target="_blank" rel="noreferrer" className="text-accent underline">Lab report</a>
                    ))}
                    <span className={t.resultBqM3 >= actionLevelBqM3 ? 'font-semibold text-state-bad' : ''}>{formatRadon(t.resultBqM3, radonUnit)}</span>
                  </span>
                </li>
              ))}
            </ul>
          </section>
          {data.tests.some((t) => t.resultBqM3 >= actionLevelBqM3) && (
            <Caution title="Result at or above the action level">
              Retest after any change to the system; results above the action level call for a certified radon professional. Follow local codes and licensed practice.
            </Caution>
          )}
        </>
      )}
    </article>
  );
}
