import { useCallback, useMemo, useRef } from 'react';
import Map, { Layer, NavigationControl, AttributionControl, Source, type MapLayerMouseEvent, type MapRef } from 'react-map-gl/maplibre';
import { addProtocol, setWorkerUrl } from 'maplibre-gl';
import { Protocol } from 'pmtiles';
import workerUrl from 'maplibre-gl/dist/maplibre-gl-worker.mjs?url';
import 'maplibre-gl/dist/maplibre-gl.css';
import type { FeatureCollection } from 'geojson';
import {
  communityFillLayer,
  communityLabelLayer,
  communityLineLayer,
  contextLayer,
  HOMES_SOURCE,
  outcomeLayer,
  postLayer,
  reworkLayer,
  selectedLayer,
  vacuumLayer,
  type MapStyleMode,
} from '../layers/home-layers';
import { renderOutcomeIcons, ICON_PIXEL_RATIO } from '../utils/outcome-icons';
import { loadCamera, saveCamera, tileQuery, type MapFilters } from '../use-map-state';
import { useHomeTilesVersion } from '@/lib/home-tiles-version';
import { HOMES_DETAIL_MIN_ZOOM, HOMES_MAX_TILE_ZOOM, HOMES_MIN_ZOOM } from '@shared/schemas/map';

// maplibre-gl 6 needs its worker URL set explicitly in a production build (STACK.md).
setWorkerUrl(workerUrl);
// A deployment's own PMTiles basemap (BASEMAP_PMTILES) is read through HTTP range requests to this app.
addProtocol('pmtiles', new Protocol().tile);

export const MAP_ID = 'survey';
const CLICKABLE = ['homes-outcome', 'homes-vacuum', 'homes-post', 'homes-rework', 'homes-context'];

export interface MapViewProps {
  filters: MapFilters;
  styleMode: MapStyleMode;
  actionLevelPciL: number;
  /** The selected home's short number (its feature id in the homes tiles), once known. */
  selectedHomeRef: number | null;
  communities: FeatureCollection;
  initialCenter: [number, number];
  /** A tap on a home names it by its short number; a tap elsewhere gives null. */
  onSelectHome(ref: number | null): void;
}

type MaplibreMap = ReturnType<MapRef['getMap']>;
const prepared = new WeakSet<MaplibreMap>();

function addOutcomeIcons(map: MaplibreMap) {
  for (const { name, image } of renderOutcomeIcons()) {
    if (!map.hasImage(name)) map.addImage(name, image, { pixelRatio: ICON_PIXEL_RATIO });
  }
}

function prepareMap(map: MaplibreMap) {
  addOutcomeIcons(map);
  if (!prepared.has(map)) {
    prepared.add(map);
    // Images belong to the style: if the style is ever loaded again, put the icons back when asked.
    map.on('styleimagemissing', () => addOutcomeIcons(map));
  }
  // A handle for browser tests and support sessions to inspect what the map drew.
  (window as unknown as { __tractwiseMap?: unknown }).__tractwiseMap = map;
}

export function MapView({ filters, styleMode, actionLevelPciL, selectedHomeRef, communities, initialCenter, onSelectHome }: MapViewProps) {
  const mapRef = useRef<MapRef>(null);
  const initialView = useMemo(() => loadCamera() ?? { longitude: initialCenter[0], latitude: initialCenter[1], zoom: 14 }, [initialCenter]);
  // The version goes up when visits or tests reach the server, so outcome symbols change without a reload.
  const tilesVersion = useHomeTilesVersion();
  const tiles = useMemo(() => [`${window.location.origin}/tiles/homes/{z}/{x}/{y}.pbf${tileQuery(filters, tilesVersion)}`], [filters, tilesVersion]);

  // With reuseMaps, react-map-gl fires 'load' again for a reused map before the ref is attached:
  // take the map from the event, never from the ref.
  const onLoad = useCallback((e: { target: Parameters<typeof prepareMap>[0] }) => prepareMap(e.target), []);

  const onClick = useCallback(
    (e: MapLayerMouseEvent) => {
      const feature = e.features?.[0];
      const ref = feature?.id;
      if (feature && ref == null) {
        // An overview mark (several homes in a few pixels, below HOMES_DETAIL_MIN_ZOOM): zoom in to them.
        e.target.easeTo({ center: e.lngLat, zoom: Math.max(HOMES_DETAIL_MIN_ZOOM + 1, e.target.getZoom() + 2) });
        return;
      }
      onSelectHome(feature ? Number(ref) : null);
    },
    [onSelectHome],
  );

  return (
    <Map
      id={MAP_ID}
      ref={mapRef}
      reuseMaps
      mapStyle="/map/style.json"
      initialViewState={initialView}
      minZoom={10}
      maxZoom={19}
      style={{ position: 'absolute', inset: 0 }}
      interactiveLayerIds={CLICKABLE}
      onClick={onClick}
      onLoad={onLoad}
      onMoveEnd={(e) => saveCamera({ longitude: e.viewState.longitude, latitude: e.viewState.latitude, zoom: e.viewState.zoom })}
      attributionControl={false}
      cursor="pointer"
    >
      <AttributionControl compact={false} position="bottom-left" />
      <NavigationControl position="top-right" showCompass={false} />
      <Source id="communities" type="geojson" data={communities}>
        <Layer {...communityFillLayer} />
        <Layer {...communityLineLayer} />
        <Layer {...communityLabelLayer} />
      </Source>
      {/* key: a new filter set means a new tile set; react-map-gl swaps the source's tiles. */}
      <Source id={HOMES_SOURCE} type="vector" tiles={tiles} minzoom={HOMES_MIN_ZOOM} maxzoom={HOMES_MAX_TILE_ZOOM}>
        {styleMode !== 'outcome' && <Layer {...contextLayer} />}
        {styleMode === 'outcome' && <Layer {...outcomeLayer} />}
        {styleMode === 'vacuum' && <Layer {...vacuumLayer} />}
        {styleMode === 'post' && <Layer {...postLayer(actionLevelPciL)} />}
        {styleMode === 'rework' && <Layer {...reworkLayer} />}
        <Layer {...selectedLayer(selectedHomeRef)} />
      </Source>
    </Map>
  );
}
