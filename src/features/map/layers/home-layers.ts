import type { LayerProps } from 'react-map-gl/maplibre';
import { OUTCOMES } from '@shared/schemas/enums';
import { iconName } from '../utils/outcome-icons';

export const HOMES_SOURCE = 'homes';
export const HOMES_SOURCE_LAYER = 'homes';

export type MapStyleMode = 'outcome' | 'vacuum' | 'post' | 'rework';

const iconByOutcome = ['match', ['get', 'outcome'], ...OUTCOMES.flatMap((o) => [o, iconName(o)]), iconName('not_visited')];

export const outcomeLayer: LayerProps = {
  id: 'homes-outcome',
  type: 'symbol',
  source: HOMES_SOURCE,
  'source-layer': HOMES_SOURCE_LAYER,
  layout: {
    // Homes in their community's latest sampling plan, not yet visited, get the "planned" symbol.
    'icon-image': ['case', ['==', ['get', 'planned'], true], iconName('planned'), iconByOutcome] as never,
    'icon-size': ['interpolate', ['linear'], ['zoom'], 12, 0.45, 15, 0.8, 18, 1.2],
    'icon-allow-overlap': true,
    'icon-ignore-placement': true,
    // Problems draw on top of everything else.
    'symbol-sort-key': ['case', ['==', ['get', 'planned'], true], 1, ['match', ['get', 'outcome'], 'needs_rework', 3, 'reworked_below', 2, 'below_action_level', 2, 'not_visited', 0, 1]] as never,
  },
};

/**
 * Single-hue sequential ramps (DESIGN.md), not rainbows. Vacuum breaks in in. WC follow the
 * common-practice reading of a standard fan on a good gravel bed ("well under 2 in. WC").
 */
export const VACUUM_BREAKS_IN_WC = [0.25, 0.5, 1, 1.5, 2] as const;
export const VACUUM_RAMP = ['#deebf7', '#b3d3ec', '#7fb2da', '#4a8cc2', '#22629f', '#0b3c73'] as const;

export function postRamp(actionLevelPciL: number) {
  return {
    breaks: [actionLevelPciL / 4, actionLevelPciL / 2, actionLevelPciL, actionLevelPciL * 2] as const,
    colours: ['#e5f2ee', '#a8d8c6', '#4fae90', '#8c4a1c', '#4d1f00'] as const,
  };
}

const hasValue = (prop: string) => ['!=', ['get', prop], null];

export const vacuumLayer: LayerProps = {
  id: 'homes-vacuum',
  type: 'circle',
  source: HOMES_SOURCE,
  'source-layer': HOMES_SOURCE_LAYER,
  filter: hasValue('vacuum_in_wc') as never,
  paint: {
    'circle-radius': ['interpolate', ['linear'], ['zoom'], 12, 3, 16, 7],
    'circle-color': ['step', ['get', 'vacuum_in_wc'], VACUUM_RAMP[0], ...VACUUM_BREAKS_IN_WC.flatMap((b, i) => [b, VACUUM_RAMP[i + 1]])] as never,
    'circle-stroke-color': '#1E2630',
    'circle-stroke-width': 0.75,
  },
};

export function postLayer(actionLevelPciL: number): LayerProps {
  const { breaks, colours } = postRamp(actionLevelPciL);
  return {
    id: 'homes-post',
    type: 'circle',
    source: HOMES_SOURCE,
    'source-layer': HOMES_SOURCE_LAYER,
    filter: hasValue('post_pci_l') as never,
    paint: {
      'circle-radius': ['interpolate', ['linear'], ['zoom'], 12, 3, 16, 7],
      'circle-color': ['step', ['get', 'post_pci_l'], colours[0], ...breaks.flatMap((b, i) => [b, colours[i + 1]])] as never,
      // At or above the action level also gets a thick ink ring: colour is never the only cue.
      'circle-stroke-color': '#1E2630',
      'circle-stroke-width': ['case', ['>=', ['get', 'post_pci_l'], actionLevelPciL], 2.5, 0.5] as never,
    },
  };
}

export const reworkLayer: LayerProps = {
  id: 'homes-rework',
  type: 'symbol',
  source: HOMES_SOURCE,
  'source-layer': HOMES_SOURCE_LAYER,
  filter: ['!=', ['get', 'outcome'], 'not_visited'] as never,
  layout: {
    // Tiles carry `rework` only when it is true.
    'icon-image': ['case', ['==', ['get', 'rework'], true], iconName('needs_rework'), iconName('below_action_level')] as never,
    'icon-size': ['interpolate', ['linear'], ['zoom'], 12, 0.45, 15, 0.8, 18, 1.2],
    'icon-allow-overlap': true,
  },
};

/** Unvisited homes stay faintly visible under the graduated styles, so the street still reads. */
export const contextLayer: LayerProps = {
  id: 'homes-context',
  type: 'circle',
  source: HOMES_SOURCE,
  'source-layer': HOMES_SOURCE_LAYER,
  paint: { 'circle-radius': ['interpolate', ['linear'], ['zoom'], 12, 1.2, 16, 3], 'circle-color': '#8A929C', 'circle-opacity': 0.5 },
};

/** A ring around the selected home, found by its short number (the tile's feature id). */
export const selectedLayer = (homeRef: number | null): LayerProps => ({
  id: 'homes-selected',
  type: 'circle',
  source: HOMES_SOURCE,
  'source-layer': HOMES_SOURCE_LAYER,
  filter: ['==', ['id'], homeRef ?? -1] as never,
  paint: { 'circle-radius': 14, 'circle-color': 'rgba(0,0,0,0)', 'circle-stroke-color': '#0F6E74', 'circle-stroke-width': 3 },
});

export const communityFillLayer: LayerProps = {
  id: 'communities-fill',
  type: 'fill',
  source: 'communities',
  paint: { 'fill-color': '#0F6E74', 'fill-opacity': 0.04 },
};
export const communityLineLayer: LayerProps = {
  id: 'communities-line',
  type: 'line',
  source: 'communities',
  paint: { 'line-color': '#0F6E74', 'line-width': 1.5, 'line-dasharray': [3, 2] },
};
export const communityLabelLayer: LayerProps = {
  id: 'communities-label',
  type: 'symbol',
  source: 'communities',
  layout: { 'text-field': ['get', 'name'], 'text-font': ['IBM Plex Sans SemiBold'], 'text-size': 13, 'text-max-width': 8 },
  paint: { 'text-color': '#0F6E74', 'text-halo-color': '#F7F4EE', 'text-halo-width': 1.5 },
};
