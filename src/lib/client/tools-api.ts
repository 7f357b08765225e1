import { get, queryString as qs } from './api';
import type { ChannelJson, FrequencyJson, PathJson, ProfilePointJson } from '../schemas/tools';

export type ChannelResult = ChannelJson;
export type FrequencyResult = FrequencyJson;
export type ProfilePoint = ProfilePointJson;
export type PathResult = PathJson;

export const toolsApi = {
  channel: (tech: string, channel: string) => get<ChannelResult>(`/api/tools/channel?${qs({ tech, channel })}`),
  frequency: (tech: string, freq_mhz: string) => get<FrequencyResult>(`/api/tools/channel?${qs({ tech, freq_mhz })}`),
  path: (p: { from: string; to: string; freq_mhz?: string; h1_m?: string; h2_m?: string; date?: string }) => get<PathResult>(`/api/tools/path?${qs(p)}`),
};
