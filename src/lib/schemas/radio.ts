// The rules that tie a cell's radio fields together (band, channel, PCI), shared by mast cells and
// the cells of a sighting. Channel and PCI checks use the 3GPP tables in lib/domain/channels.ts.
import type { z } from 'zod';
import { getBand, isChannelInBand, isKnownBand, lookupChannel } from '../domain/channels';
import { TECHS, type Tech } from './mast-enums';

/**
 * PCI ranges: LTE 0–503 (TS 36.211 §6.11), NR 0–1007 (TS 38.211 §7.4.2.1); UMTS primary scrambling
 * code 0–511 (TS 25.213 — from memory, verify). GSM has no PCI.
 */
export const PCI_MAX: Record<Tech, number | null> = { lte: 503, nr: 1007, umts: 511, gsm: null };

/** Band label as stored: LTE `B20`, NR `n78`, UMTS `I`/`VIII`, GSM `DCS1800` … (channels.ts). */
export interface BandRef {
  tech: Tech;
  band: string;
}

/** Every technology's band a label may mean: "20" is both LTE B20 and NR n20; "B20" only LTE. */
export function resolveBandLabel(label: string): BandRef[] {
  return TECHS.filter((tech) => isKnownBand(tech, label)).map((tech) => ({ tech, band: getBand(tech, label).band }));
}

/** Band, channel and PCI as typed; `checkRadio` resolves the band and downlink frequency. */
export interface RadioFields {
  tech: Tech;
  band?: string | null;
  channel: number;
  pci?: number | null;
}

/**
 * The band must exist for the technology and hold the channel (derived from the channel when not
 * given), and the PCI must be in the technology's range.
 */
export function checkRadio(v: RadioFields, ctx: z.RefinementCtx): { band: string; dlMhz: number } {
  let band: string | null = null;
  let dlMhz = Number.NaN;
  if (v.band) {
    if (!isKnownBand(v.tech, v.band)) {
      ctx.addIssue({ code: 'custom', path: ['band'], message: `Unknown ${v.tech.toUpperCase()} band '${v.band}'` });
    } else if (!isChannelInBand(v.tech, v.channel, v.band)) {
      const b = getBand(v.tech, v.band);
      const ranges = b.dlChannels.map((r) => `${r.first}–${r.last}`).join(', ');
      ctx.addIssue({ code: 'custom', path: ['channel'], message: `Channel ${v.channel} is not in band ${b.band} (downlink ${ranges})` });
    } else {
      band = getBand(v.tech, v.band).band;
      dlMhz = lookupChannel(v.tech, v.channel, { band }).dlMhz;
    }
  } else {
    try {
      const info = lookupChannel(v.tech, v.channel);
      band = info.band;
      dlMhz = info.dlMhz;
    } catch (err) {
      ctx.addIssue({ code: 'custom', path: ['channel'], message: err instanceof Error ? err.message : 'Channel is in no known band' });
    }
  }
  const max = PCI_MAX[v.tech];
  if (v.pci !== null && v.pci !== undefined) {
    if (max === null) ctx.addIssue({ code: 'custom', path: ['pci'], message: 'GSM cells have no PCI' });
    else if (v.pci > max) ctx.addIssue({ code: 'custom', path: ['pci'], message: `${v.tech.toUpperCase()} PCI must be 0–${max}` });
  }
  return { band: band ?? '', dlMhz };
}
