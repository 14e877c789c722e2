import { Link, useNavigate, useParams } from 'react-router-dom';
import { useHome } from '@/features/homes/api/get-home';
import { useSettings } from '@/features/settings/api/settings';
import { useFans } from '@/features/fans/api/get-fans';
import { VisitForm } from '@/features/visits/components/visit-form';
import { PanelBoundary } from '@/components/ui/panel-boundary';

/** Record a visit: phone-first, works offline (the visit waits on the device until it can be sent). */
export function RecordVisitRoute() {
  const { homeId = '' } = useParams();
  const navigate = useNavigate();
  const home = useHome(homeId);
  const settings = useSettings();
  const fans = useFans();
  const back = () => navigate(`/?home=${homeId}`);
  // Without a connection the home cannot load: open the form at once rather than wait for retries.
  const offline = typeof navigator !== 'undefined' && navigator.onLine === false;
  const waitingForHome = !offline && home.isPending && home.fetchStatus === 'fetching';
  const actionLevel = settings.data?.settings.actionLevelBqM3;
  const aboveActionLevel = Boolean(actionLevel && home.data?.tests.some((t) => t.resultBqM3 >= actionLevel));

  return (
    <div className="mx-auto max-w-xl px-4 pt-3">
      <Link to={`/?home=${homeId}`} className="inline-flex min-h-11 items-center text-sm text-accent underline">Back to the map</Link>
      <h1 className="text-xl font-semibold">Record a visit</h1>
      <p className="mb-4 text-sm text-muted" data-testid="visit-home-address">
        {home.data
          ? `${home.data.home.address}, ${home.data.home.city}`
          : waitingForHome
            ? 'Loading the home…'
            : offline || home.isPending
              ? 'No connection: the visit is kept on this device and sent later.'
              : 'Home details could not be loaded; the visit can still be recorded.'}
      </p>
      {waitingForHome ? null : fans.isPending ? (
        // The device's copy of the fan list shows at once; without one, wait for the server's.
        <p className="text-muted">Loading the fan list…</p>
      ) : (
        <PanelBoundary>
          <VisitForm
            homeId={homeId}
            homeLabel={home.data?.home.address ?? 'this home'}
            pipeSizeIn={home.data?.home.pipeSizeIn ?? null}
            pfeTargetPa={settings.data?.settings.pfeTargetPa}
            aboveActionLevel={aboveActionLevel}
            onSaved={back}
            onCancel={back}
            fans={fans.data?.fans ?? []}
            fansError={fans.data ? null : fans.error}
          />
        </PanelBoundary>
      )}
    </div>
  );
}
