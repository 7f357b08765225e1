// The measured signal layer's choices in the map's address (`/map?signal=rsrp&signal_operator=2&signal_band=B20`),
// beside the mast and view parameters of lib/client/map-url.ts. Pure.
import { SignalTileQuerySchema } from '../../lib/schemas/signal-map';
import { SIGNAL_METRICS, type SignalMetric } from '../../lib/domain/signal-map';
import { SIGNAL_OFF, type SignalState } from './signal-layers';

export const SIGNAL_URL_PARAMS = ['signal', 'signal_operator', 'signal_band'] as const;

/** Whether the signal tiles would take this operator and band (the tile endpoint's own check). */
const tilesTake = (operator: string, band: string) => SignalTileQuerySchema.safeParse({ operator, band }).success;

/**
 * The layer's choices held by a map link: switched on by `signal=<metric>`; anything the signal
 * tiles would refuse is ignored (a malformed operator id, a band that no cell has, a band without
 * its operator: a band is one operator's).
 */
export function readSignalUrl(search: string): SignalState {
  const p = new URLSearchParams(search);
  const metric = p.get('signal');
  if (!metric || !(SIGNAL_METRICS as readonly string[]).includes(metric)) return SIGNAL_OFF;
  const operator = p.get('signal_operator') ?? '';
  const operatorId = tilesTake(operator, '') ? operator : '';
  const band = p.get('signal_band') ?? '';
  return { on: true, metric: metric as SignalMetric, operatorId, band: operatorId && tilesTake(operatorId, band) ? band : '' };
}

/**
 * The choices with an operator that is not among `operators` (one since removed, a mistyped link)
 * dropped, and its band with it; as they are while the operators are still loading (null).
 */
export function withKnownOperator(state: SignalState, operators: readonly { id: string }[] | null): SignalState {
  return !operators || !state.operatorId || operators.some((o) => o.id === state.operatorId) ? state : { ...state, operatorId: '', band: '' };
}

/** The query string with the layer's choices written in (none while it is off); other parameters are kept. */
export function writeSignalUrl(search: string, state: SignalState): string {
  const p = new URLSearchParams(search);
  for (const name of SIGNAL_URL_PARAMS) p.delete(name);
  if (state.on) {
    p.set('signal', state.metric);
    if (state.operatorId) p.set('signal_operator', state.operatorId);
    if (state.operatorId && state.band) p.set('signal_band', state.band);
  }
  const text = p.toString();
  return text ? `?${text}` : '';
}
