import { useMemo } from 'react';
import { Layer, Source, useMap } from 'react-map-gl/maplibre';
import { REGION_LINE_LAYER_ID } from './layers';
import { SIGNAL_SOURCE_ID, signalFillLayer, signalLineLayer, signalSource, type SignalState } from './signal-layers';

interface Props {
  origin: string;
  state: SignalState;
  /** Drawn under this layer when the map has it (under region outlines and masts by default). */
  beforeId?: string;
}

/** The measured signal hexagons, under the map's other data layers; nothing while switched off. */
export default function SignalLayer({ origin, state, beforeId = REGION_LINE_LAYER_ID }: Props) {
  const { current } = useMap();
  const { operatorId, band } = state;
  const source = useMemo(() => signalSource(origin, { operatorId, band }), [origin, operatorId, band]);
  const fill = useMemo(() => signalFillLayer(state.metric), [state.metric]);
  const line = useMemo(() => signalLineLayer(state.metric), [state.metric]);
  if (!state.on) return null;
  // When it is switched on with the map already drawn, go under the outlines and masts; at the
  // map's start it comes first anyway.
  const before = current?.getMap().getLayer(beforeId) ? beforeId : undefined;
  return (
    // A new key per filter: MapLibre cannot change a vector source's tile URL in place.
    <Source key={source.tiles![0]} id={SIGNAL_SOURCE_ID} {...source}>
      <Layer {...fill} beforeId={before} />
      <Layer {...line} beforeId={before} />
    </Source>
  );
}
