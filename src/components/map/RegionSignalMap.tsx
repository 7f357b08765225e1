import 'maplibre-gl/dist/maplibre-gl.css';
import { useMemo, useState } from 'react';
import Map, { Layer, NavigationControl, ScaleControl, Source } from 'react-map-gl/maplibre';
import { REGION_LINE_LAYER, REGION_SOURCE_ID } from './layers';
import { regionFeatures, sortBands } from './map-data';
import { useMapSetup } from './use-map-setup';
import { SIGNAL_OFF, type SignalState } from './signal-layers';
import SignalLayer from './SignalLayer';
import SignalPanel from './SignalPanel';

interface Props {
  regionId: string;
  /** Bands to offer in the band choice (e.g. the region's cells' bands). */
  bands?: readonly string[];
}

/** The whole outline clear of the controls: the signal switch at the top left, the zoom buttons at the top right, the link at the bottom. */
const FIT_PADDING = { top: 56, right: 48, bottom: 40, left: 24 };

/**
 * A small map of one region with the measured signal layer switched on, its choices and legend
 * (for the region page; mount with client:only="react"). The full map opens at the same region.
 */
export default function RegionSignalMap({ regionId, bands = [] }: Props) {
  const { style, operators, regions, loadError } = useMapSetup();
  const [signal, setSignal] = useState<SignalState>({ ...SIGNAL_OFF, on: true });
  const region = regions.find((r) => r.id === regionId) ?? null;
  const outline = useMemo(() => regionFeatures(region ? [region] : []), [region]);
  const origin = typeof window !== 'undefined' ? window.location.origin : '';

  return (
    <div className="relative h-[26rem] w-full overflow-hidden rounded-lg border border-ink-200 bg-[#c9d9e3]" data-testid="region-signal-map">
      {loadError && (
        <p role="alert" className="absolute inset-x-3 top-3 z-30 rounded-md border border-alarm-100 bg-alarm-50 p-2 text-sm text-alarm-700">
          {loadError}
        </p>
      )}
      {!loadError && (!style || !operators) && <p className="absolute inset-0 flex items-center justify-center text-sm text-ink-600">Loading the map…</p>}
      {style && operators && !region && (
        <p className="absolute inset-0 flex items-center justify-center text-sm text-ink-600">This region has no outline to show.</p>
      )}
      {style && operators && region && (
        <Map
          initialViewState={{ bounds: region.bbox, fitBoundsOptions: { padding: FIT_PADDING } }}
          // Fitted again once the map has its size: the first fit can run before the frame is laid out.
          onLoad={(e) => e.target.fitBounds(region.bbox, { padding: FIT_PADDING, duration: 0 })}
          mapStyle={style}
          maxZoom={16}
          attributionControl={{ compact: true }}
          dragRotate={false}
          touchPitch={false}
          cooperativeGestures
          style={{ position: 'absolute', inset: 0 }}
        >
          <NavigationControl position="top-right" showCompass={false} />
          <ScaleControl position="bottom-right" unit="metric" />
          <SignalLayer origin={origin} state={signal} />
          <Source id={REGION_SOURCE_ID} type="geojson" data={outline}>
            <Layer {...REGION_LINE_LAYER} />
          </Source>
        </Map>
      )}
      {operators && (
        <div className="pointer-events-none absolute left-2 top-2 z-20 max-w-[calc(100%-3.5rem)]">
          <SignalPanel operators={operators} bands={sortBands(bands)} value={signal} onChange={setSignal} compact />
        </div>
      )}
      <a
        href={`/map?region=${encodeURIComponent(regionId)}`}
        className="absolute bottom-8 left-2 z-10 rounded bg-white/95 px-2 py-1 text-xs font-semibold text-ink-800 shadow hover:underline"
      >
        Open on the full map
      </a>
    </div>
  );
}
