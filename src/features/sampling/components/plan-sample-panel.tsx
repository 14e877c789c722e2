import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Field } from '@/components/ui/field';
import { Button } from '@/components/ui/button';
import { ErrorNote } from '@/components/ui/error-note';
import { EmptyState } from '@/components/ui/empty-state';
import { useSampleSize } from '../api/get-sample-size';
import { usePlan, usePlans } from '../api/get-plans';
import { useCreatePlan } from '../api/create-plan';

const MARGINS = [0.05, 0.1, 0.15, 0.2];

/** Choose a margin of error and a failure rate, see how many homes that takes, and save which ones. */
export function PlanSamplePanel({ communities }: { communities: { id: string; name: string }[] }) {
  const [communityId, setCommunityId] = useState('');
  const [margin, setMargin] = useState(0.1);
  const [rateSource, setRateSource] = useState<'assumed' | 'observed'>('assumed');
  const [assumedPct, setAssumedPct] = useState('50');
  const [openPlanId, setOpenPlanId] = useState<string | null>(null);
  const assumed = Number(assumedPct) / 100;
  const validAssumed = assumedPct !== '' && assumed >= 0 && assumed <= 1;
  const params = communityId && (rateSource === 'observed' || validAssumed) ? { communityId, marginOfError: margin, rateSource, expectedRate: rateSource === 'assumed' ? assumed : undefined } : null;
  const size = useSampleSize(params);
  const plans = usePlans(communityId || null);
  const create = useCreatePlan();
  const shownPlanId = openPlanId ?? plans.data?.plans[0]?.id ?? null;
  const plan = usePlan(shownPlanId);

  return (
    <div className="grid gap-4 lg:grid-cols-[22rem_1fr]">
      <form
        className="flex flex-col gap-3 rounded-md border border-rule bg-panel p-4"
        onSubmit={(e) => {
          e.preventDefault();
          if (params) create.mutate(params, { onSuccess: ({ plan: p }) => setOpenPlanId(p.id) });
        }}
      >
        <Field label="Community">
          <select value={communityId} onChange={(e) => { setCommunityId(e.target.value); setOpenPlanId(null); }} required>
            <option value="">Choose a community</option>
            {communities.map((c) => <option key={c.id} value={c.id}>{c.name}</option>)}
          </select>
        </Field>
        <Field label="Margin of error at 95 % confidence" unit="± points">
          <select value={margin} onChange={(e) => setMargin(Number(e.target.value))}>
            {MARGINS.map((m) => <option key={m} value={m}>{Math.round(m * 100)}</option>)}
          </select>
        </Field>
        <fieldset className="flex flex-col gap-2 text-sm">
          <legend className="font-medium">Failure rate to plan for</legend>
          <label className="flex min-h-11 items-center gap-2">
            <input type="radio" name="rate" checked={rateSource === 'assumed'} onChange={() => setRateSource('assumed')} /> Assume a rate
          </label>
          {rateSource === 'assumed' && (
            <Field label="Assumed failure rate" unit="%" hint="50 % is the cautious choice: it gives the largest sample." error={validAssumed ? undefined : 'between 0 and 100'}>
              <input type="number" inputMode="decimal" min={0} max={100} value={assumedPct} onChange={(e) => setAssumedPct(e.target.value)} />
            </Field>
          )}
          <label className="flex min-h-11 items-center gap-2">
            <input type="radio" name="rate" checked={rateSource === 'observed'} onChange={() => setRateSource('observed')} /> Use what sampled homes showed (pooled with the builder's other communities)
          </label>
        </fieldset>
        {size.error && <ErrorNote error={size.error} />}
        {size.data && (
          <div className="rounded-md bg-paper p-3 text-sm tabular" data-testid="sample-size">
            <p className="text-lg font-semibold">{size.data.size.sampleSize} homes to sample</p>
            <p className="text-muted">of {size.data.size.homesTotal} homes (Cochran, with the finite-population correction); rate {size.data.size.rateNote}.</p>
            <p className="mt-1">{size.data.size.alreadySampled} already sampled · <strong>{size.data.size.toVisit} more to visit</strong> · {size.data.size.eligible} homes can still be sampled (do-not-contact and declined homes are skipped).</p>
          </div>
        )}
        {create.error && <ErrorNote error={create.error} />}
        <Button type="submit" disabled={!params || create.isPending}>{create.isPending ? 'Choosing homes…' : 'Choose the homes and save the plan'}</Button>
      </form>

      <section aria-label="Sampling plan" className="flex flex-col gap-3">
        {!communityId && <EmptyState title="Choose a community">The plan spreads the homes to sample across the whole community, not along one street.</EmptyState>}
        {communityId && plans.data?.plans.length === 0 && <EmptyState title="No plan for this community yet">Set the margin and rate, then save a plan.</EmptyState>}
        {plans.data && plans.data.plans.length > 1 && (
          <Field label="Plan">
            <select value={shownPlanId ?? ''} onChange={(e) => setOpenPlanId(e.target.value)}>
              {plans.data.plans.map((p, i) => (
                <option key={p.id} value={p.id}>{`${p.createdAt.slice(0, 10)} · ±${Math.round(p.marginOfError * 100)} points · ${p.sampleSize} homes${i === 0 ? ' (latest, on the map)' : ''}`}</option>
              ))}
            </select>
          </Field>
        )}
        {plan.error && <ErrorNote error={plan.error} />}
        {plan.data && (
          <div className="rounded-md border border-rule bg-panel p-4">
            <div className="mb-2 flex flex-wrap items-baseline gap-3">
              <h2 className="text-base font-semibold">{plan.data.plan.communityName}: {plan.data.plan.homes.length} homes to visit</h2>
              <Link className="text-accent underline" to={`/?communityId=${plan.data.plan.communityId}`}>Show the plan on the map</Link>
            </div>
            <p className="mb-2 text-sm text-muted">
              Saved {plan.data.plan.createdAt.slice(0, 10)}{plan.data.plan.createdByName ? ` by ${plan.data.plan.createdByName}` : ''} · ±{Math.round(plan.data.plan.marginOfError * 100)} points at 95 % · planned rate {Math.round(plan.data.plan.expectedRate * 100)} %. Technicians see “Sample this home” on these homes until they are visited.
            </p>
            <ol className="columns-1 gap-6 text-sm sm:columns-2">
              {plan.data.plan.homes.map((h) => (
                <li key={h.id} className="flex justify-between gap-2 border-b border-rule/60 py-1">
                  <span>{h.address}</span>
                  <span className={h.sampled ? 'text-state-good' : 'text-muted'}>{h.sampled ? 'sampled' : 'to visit'}</span>
                </li>
              ))}
            </ol>
          </div>
        )}
      </section>
    </div>
  );
}
