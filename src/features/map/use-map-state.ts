import { useCallback, useMemo } from 'react';
import { useSearchParams } from 'react-router-dom';
import type { Outcome } from '@shared/schemas/enums';
import type { MapStyleMode } from './layers/home-layers';

export interface MapFilters {
  builderId?: string;
  communityId?: string;
  yearFrom?: number;
  yearTo?: number;
  outcome?: Outcome[];
}

export interface Camera {
  longitude: number;
  latitude: number;
  zoom: number;
}

const CAMERA_KEY = 'tractwise.map.camera';
const FILTER_KEYS = ['builderId', 'communityId', 'yearFrom', 'yearTo', 'outcome', 'style', 'home'] as const;
const LAST_SEARCH_KEY = 'tractwise.map.search';

/** The camera survives reloads (localStorage); filters, style and the open home live in the URL so links can be shared. */
export function loadCamera(): Camera | null {
  try {
    const raw = localStorage.getItem(CAMERA_KEY);
    return raw ? (JSON.parse(raw) as Camera) : null;
  } catch {
    return null;
  }
}

export function saveCamera(camera: Camera) {
  localStorage.setItem(CAMERA_KEY, JSON.stringify(camera));
}

/** Restores the last filters when the map is opened without any (e.g. from the navigation). */
export function restoredSearch(search: string): string | null {
  if (search && search !== '?') return null;
  return localStorage.getItem(LAST_SEARCH_KEY);
}

export function useMapState() {
  const [params, setParams] = useSearchParams();

  const filters = useMemo<MapFilters>(() => {
    const num = (k: string) => (params.get(k) ? Number(params.get(k)) : undefined);
    const outcome = params.get('outcome')?.split(',').filter(Boolean) as Outcome[] | undefined;
    return {
      builderId: params.get('builderId') ?? undefined,
      communityId: params.get('communityId') ?? undefined,
      yearFrom: num('yearFrom'),
      yearTo: num('yearTo'),
      outcome: outcome?.length ? outcome : undefined,
    };
  }, [params]);
  const styleMode = (params.get('style') as MapStyleMode | null) ?? 'outcome';
  const selectedHomeId = params.get('home');

  const update = useCallback(
    (patch: Partial<Record<(typeof FILTER_KEYS)[number], string | undefined | null>>) => {
      setParams(
        (prev) => {
          const next = new URLSearchParams(prev);
          for (const [k, v] of Object.entries(patch)) {
            if (v === undefined || v === null || v === '') next.delete(k);
            else next.set(k, v);
          }
          localStorage.setItem(LAST_SEARCH_KEY, `?${next}`);
          return next;
        },
        { replace: true },
      );
    },
    [setParams],
  );

  return { filters, styleMode, selectedHomeId, update };
}

/**
 * Query string for the homes tile URL: exactly the filters, so the tile cache key follows them, plus
 * the data version once records were saved during this page's life (new URL → fresh tiles).
 */
export function tileQuery(filters: MapFilters, dataVersion = 0): string {
  const q = new URLSearchParams();
  if (filters.builderId) q.set('builderId', filters.builderId);
  if (filters.communityId) q.set('communityId', filters.communityId);
  if (filters.yearFrom !== undefined) q.set('yearFrom', String(filters.yearFrom));
  if (filters.yearTo !== undefined) q.set('yearTo', String(filters.yearTo));
  if (filters.outcome?.length) q.set('outcome', filters.outcome.join(','));
  if (dataVersion > 0) q.set('v', String(dataVersion));
  const s = q.toString();
  return s ? `?${s}` : '';
}
