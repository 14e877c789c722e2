import { Link, useNavigate, useParams } from 'react-router-dom';
import { useHome } from '@/features/homes/api/get-home';
import { useSettings } from '@/features/settings/api/settings';
import { RadonTestForm } from '@/features/visits/components/radon-test-form';
import { latestActivation } from '@/features/visits/utils/latest-activation';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { useOutbox } from '@/lib/outbox';
import { EPA_ACTION_LEVEL_BQ_M3 } from '@shared/domain/radon-tests';

/** Record a radon test for a home; like a visit, it waits on the device until it can be sent. */
export function RecordTestRoute() {
  const { homeId = '' } = useParams();
  const navigate = useNavigate();
  const home = useHome(homeId);
  const settings = useSettings();
  const outbox = useOutbox();
  const back = () => navigate(`/?home=${homeId}`);
  const offline = typeof navigator !== 'undefined' && navigator.onLine === false;
  const waiting = !offline && ((home.isPending && home.fetchStatus === 'fetching') || (settings.isPending && settings.fetchStatus === 'fetching'));
  const fanActivatedAt = latestActivation(home.data?.visits ?? [], outbox.pending, homeId);
  const visited = Boolean(fanActivatedAt) || Boolean(home.data?.visits.some((v) => v.status === 'completed'));

  return (
    <div className="mx-auto max-w-xl px-4 pt-3">
      <Link to={`/?home=${homeId}`} className="inline-flex min-h-11 items-center text-sm text-accent underline">Back to the map</Link>
      <h1 className="text-xl font-semibold">Record a radon test</h1>
      <p className="mb-4 text-sm text-muted">
        {home.data
          ? `${home.data.home.address}, ${home.data.home.city}`
          : waiting
            ? 'Loading the home…'
            : 'Home details could not be loaded: the test is kept on this device and sent later.'}
      </p>
      {waiting ? null : (
        <PanelBoundary>
          <RadonTestForm
            homeId={homeId}
            homeLabel={home.data?.home.address ?? 'this home'}
            radonUnit={settings.data?.settings.radonUnit ?? 'pCi/L'}
            actionLevelBqM3={settings.data?.settings.actionLevelBqM3 ?? EPA_ACTION_LEVEL_BQ_M3}
            fanActivatedAt={fanActivatedAt}
            defaultKind={visited ? 'post' : 'pre'}
            onSaved={back}
            onCancel={back}
          />
        </PanelBoundary>
      )}
    </div>
  );
}
