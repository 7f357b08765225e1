import { handler, json, parseQuery, requirePermission } from '../../../lib/server/http';
import { ChannelQuerySchema, type ChannelJson, type FrequencyJson } from '../../../lib/schemas/tools';
import { ChannelError, findChannelsForFrequency, lookupChannel } from '../../../lib/domain/channels';
import { ValidationError } from '../../../lib/server/errors';

// Channel number → band and carrier frequencies, or frequency → candidate channels.
export const GET = handler(({ locals, url }) => {
  requirePermission(locals, 'tools:use');
  const q = parseQuery(ChannelQuerySchema, url);
  if (q.freq_mhz !== undefined) {
    const items = findChannelsForFrequency(q.tech, q.freq_mhz).filter((c) => !q.band || c.band === q.band);
    if (items.length === 0) {
      throw new ValidationError(`${q.freq_mhz} MHz is in no known ${q.tech.toUpperCase()} band`, {
        freq_mhz: [`${q.freq_mhz} MHz is in no known ${q.tech.toUpperCase()} band`],
      });
    }
    const body: FrequencyJson = {
      tech: q.tech,
      freq_mhz: q.freq_mhz,
      ambiguous: new Set(items.map((i) => i.band)).size > 1,
      items: items.map((i) => ({ band: i.band, channel: i.channel, direction: i.direction, exact: i.exact })),
      total: items.length,
    };
    return json(body);
  }
  try {
    const info = lookupChannel(q.tech, q.channel!, { band: q.band });
    const body: ChannelJson = {
      tech: info.tech,
      channel: info.channel,
      band: info.band,
      duplex: info.duplex,
      direction: info.direction,
      dl_channel: info.dlChannel,
      dl_mhz: info.dlMhz,
      ul_channel: info.ulChannel,
      ul_mhz: info.ulMhz,
      alternative_bands: info.alternativeBands,
      notes: info.notes,
    };
    return json(body);
  } catch (err) {
    if (err instanceof ChannelError) {
      throw new ValidationError(err.message, { [err.code === 'UNKNOWN_BAND' ? 'band' : 'channel']: [err.message] });
    }
    throw err;
  }
});
