// The measured signal layer's choices in the map's address (`/map?signal=rsrp&signal_operator=2&signal_band=B20`),
// beside the mast and view parameters of lib/client/map-url.ts. Pure.
import { ID_PATTERN } from '../../lib/schemas/params';
import { SIGNAL_METRICS, type SignalMetric } from '../../lib/domain/signal-map';
import { SIGNAL_OFF, type SignalState } from './signal-layers';

export const SIGNAL_URL_PARAMS = ['signal', 'signal_operator', 'signal_band'] as const;

/** Band labels as stored on cells: B20, n78, B3 … */
const BAND = /^[A-Za-z]{0,2}\d{1,4}[A-Za-z]?$/;

/** The layer's choices held by a map link: switched on by `signal=<metric>`; anything malformed is ignored. */
export function readSignalUrl(search: string): SignalState {
  const p = new URLSearchParams(search);
  const metric = p.get('signal');
  if (!metric || !(SIGNAL_METRICS as readonly string[]).includes(metric)) return SIGNAL_OFF;
  const operator = p.get('signal_operator') ?? '';
  const operatorId = ID_PATTERN.test(operator) ? operator : '';
  const band = p.get('signal_band') ?? '';
  // A band is one operator's: without an operator it means nothing.
  return { on: true, metric: metric as SignalMetric, operatorId, band: operatorId && BAND.test(band) ? band : '' };
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
