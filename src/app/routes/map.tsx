import { useEffect, useMemo, useRef, useState } from 'react';
import { MapProvider, useMap } from 'react-map-gl/maplibre';
import { useQueryClient } from '@tanstack/react-query';
import { Link, useNavigate, useLocation } from 'react-router-dom';
import { bbox } from '@turf/turf';
import type { FeatureCollection } from 'geojson';
import { MapView, MAP_ID } from '@/features/map/components/map-view';
import { MapLegend } from '@/features/map/components/map-legend';
import { MapFiltersPanel } from '@/features/map/components/map-filters';
import { restoredSearch, useMapState } from '@/features/map/use-map-state';
import { HomePanel } from '@/features/homes/components/home-panel';
import { homeIdByRef, useHome } from '@/features/homes/api/get-home';
import { AddressSearch } from '@/features/homes/components/address-search';
import { useCommunities } from '@/features/communities/api/get-communities';
import { useBuilders } from '@/features/builders/api/get-builders';
import { useSettings } from '@/features/settings/api/settings';
import { PanelBoundary } from '@/components/ui/panel-boundary';
import { EmptyState } from '@/components/ui/empty-state';
import { ErrorNote } from '@/components/ui/error-note';
import { ApiError } from '@/lib/api-client';
import { useSession } from '@/features/auth/api/get-session';
import { FIELD_ROLES } from '@/features/visits/utils/roles';
import { useOutbox } from '@/lib/outbox';
import { bqM3ToPciL } from '@shared/domain/units';

export function MapRoute() {
  const location = useLocation();
  const navigate = useNavigate();
  // Opening the map from the navigation brings back the last filters (map state survives reload).
  const restore = restoredSearch(location.search);
  useEffect(() => {
    if (restore) navigate({ search: restore }, { replace: true });
  }, [restore, navigate]);
  return (
    <MapProvider>
      <MapScreen />
    </MapProvider>
  );
}

function MapScreen() {
  const { filters, styleMode, selectedHomeId, update } = useMapState();
  const communities = useCommunities();
  const builders = useBuilders();
  const settings = useSettings();
  const maps = useMap();
  const [filtersOpen, setFiltersOpen] = useState(false);
  const queryClient = useQueryClient();
  const selectedHome = useHome(selectedHomeId);
  // A tap that could not open its home (offline, or the home was just deleted).
  const [tapError, setTapError] = useState<unknown>(null);
  const lastTap = useRef(0);

  const communityFc = useMemo<FeatureCollection>(
    () => ({
      type: 'FeatureCollection',
      features: (communities.data?.communities ?? [])
        .filter((c) => c.boundary)
        .map((c) => ({ type: 'Feature', id: c.id, properties: { id: c.id, name: c.name }, geometry: c.boundary! })),
    }),
    [communities.data],
  );
  const center = useMemo<[number, number] | null>(() => {
    if (!communities.data) return null;
    if (communityFc.features.length === 0) return [0, 0];
    const [w, s, e, n] = bbox(communityFc);
    return [(w + e) / 2, (s + n) / 2];
  }, [communities.data, communityFc]);

  const actionLevelBqM3 = settings.data?.settings.actionLevelBqM3 ?? 148;
  const radonUnit = settings.data?.settings.radonUnit ?? 'pCi/L';

  const filterPanel = (
    <MapFiltersPanel
      filters={filters}
      styleMode={styleMode}
      builders={builders.data?.builders ?? []}
      communities={communities.data?.communities ?? []}
      onChange={update}
    />
  );

  return (
    <div className="relative h-full w-full overflow-hidden">
      {center && (
        <PanelBoundary>
          <MapView
            filters={filters}
            styleMode={styleMode}
            actionLevelPciL={bqM3ToPciL(actionLevelBqM3)}
            selectedHomeRef={selectedHome.data?.home.ref ?? null}
            communities={communityFc}
            initialCenter={center}
            onSelectHome={(ref) => {
              // Only the latest tap counts: an answer to an earlier one that arrives late is dropped.
              const tap = ++lastTap.current;
              setTapError(null);
              if (ref == null) return update({ home: undefined });
              homeIdByRef(queryClient, ref).then(
                (id) => tap === lastTap.current && update({ home: id }),
                (err: unknown) =>
                  tap === lastTap.current &&
                  setTapError(err instanceof ApiError ? err : new Error('That home could not be opened: the server did not answer. Tap it again once you are back online.')),
              );
            }}
          />
        </PanelBoundary>
      )}
      {tapError != null && (
        <div className="absolute inset-x-4 bottom-20 z-20 mx-auto max-w-md">
          <ErrorNote error={tapError} />
        </div>
      )}
      {communities.data && communities.data.communities.length === 0 && (
        <div className="absolute inset-x-4 top-20 z-10 mx-auto max-w-md">
          <EmptyState title="No communities on the map yet">Import addresses to start a community.</EmptyState>
        </div>
      )}

      {/* Search and filters: a column on desktop, a bar plus a sheet on a phone. */}
      <div className="absolute left-2 right-14 top-2 z-10 flex flex-col gap-2 sm:right-auto sm:w-80">
        <AddressSearch
          onPick={(home) => {
            lastTap.current++;
            update({ home: home.id });
            maps[MAP_ID]?.flyTo({ center: [home.lon, home.lat], zoom: 17 });
          }}
        />
        <button className="min-h-11 rounded-md border border-rule bg-panel px-3 text-sm shadow-sm sm:hidden" onClick={() => setFiltersOpen((o) => !o)} aria-expanded={filtersOpen}>
          {filtersOpen ? 'Hide filters' : 'Filters and style'}
        </button>
        <div className={`${filtersOpen ? 'block' : 'hidden'} max-h-[60vh] overflow-auto rounded-md border border-rule bg-panel p-3 shadow-sm sm:block`}>{filterPanel}</div>
      </div>

      <div className={`absolute bottom-8 right-2 z-10 max-w-[16rem] ${selectedHomeId ? 'hidden sm:block sm:right-[25rem]' : ''}`}>
        <MapLegend styleMode={styleMode} actionLevelPciL={bqM3ToPciL(actionLevelBqM3)} />
      </div>

      {selectedHomeId && (
        <div className="absolute inset-x-0 bottom-0 z-20 max-h-[60%] overflow-auto rounded-t-xl border-t border-rule bg-panel p-4 shadow-lg sm:inset-x-auto sm:bottom-0 sm:right-0 sm:top-0 sm:max-h-none sm:w-96 sm:rounded-none sm:border-l sm:border-t-0">
          <PanelBoundary>
            <HomePanel
              homeId={selectedHomeId}
              radonUnit={radonUnit}
              actionLevelBqM3={actionLevelBqM3}
              onClose={() => {
                lastTap.current++;
                update({ home: undefined });
              }}
              actions={<FieldActions homeId={selectedHomeId} />}
            />
          </PanelBoundary>
        </div>
      )}
    </div>
  );
}

const ACTION_LINK = 'inline-flex min-h-11 items-center rounded-md px-4 font-medium';

/** Recording field work, for the roles that do it, and what of it still waits on this device. */
function FieldActions({ homeId }: { homeId: string }) {
  const session = useSession();
  const outbox = useOutbox();
  const role = session.data?.user?.role;
  if (!role || !FIELD_ROLES.includes(role)) return null;
  const waiting = outbox.pending.filter((i) => i.homeId === homeId);
  const count = (kind: string, one: string, many: string) => {
    const n = waiting.filter((i) => i.kind === kind).length;
    return n === 0 ? null : `${n} ${n === 1 ? one : many}`;
  };
  const parts = [
    count('visit', 'visit', 'visits'),
    count('photo', 'photo', 'photos'),
    count('radon_test', 'radon test', 'radon tests'),
    count('lab_report', 'lab report', 'lab reports'),
  ].filter(Boolean);
  return (
    <>
      <Link to={`/homes/${homeId}/visit`} className={`${ACTION_LINK} bg-accent text-white hover:bg-accent-dark`}>Record a visit</Link>
      <Link to={`/homes/${homeId}/test`} className={`${ACTION_LINK} border border-rule bg-panel text-ink hover:border-accent`}>Record a radon test</Link>
      {waiting.length > 0 && (
        <p className="w-full text-sm text-muted" data-testid="home-waiting">
          On this device, waiting to send: {parts.join(', ')}.
        </p>
      )}
    </>
  );
}
