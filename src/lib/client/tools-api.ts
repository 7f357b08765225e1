// The calculators: channel number ↔ frequency, and a path (bearings, clearance, terrain profile).
import { get, withQuery, type QueryOf } from './api';
import type { ChannelJson, ChannelQuerySchema, FrequencyJson, PathJson, PathQuerySchema } from '../schemas/tools';

export const toolsApi = {
  /** With `channel`: its band and frequencies (ChannelJson); with `freq_mhz`: the channels that carry it (FrequencyJson). */
  channel: (query: QueryOf<typeof ChannelQuerySchema>) => get<ChannelJson | FrequencyJson>(withQuery('/api/tools/channel', query)),
  path: (query: QueryOf<typeof PathQuerySchema>) => get<PathJson>(withQuery('/api/tools/path', query)),
};
