// The kit catalogue: antennas and cables.
import type { z } from 'zod';
import { get, request, seg, type List } from './api';
import type { AntennaChangeSchema, AntennaInputSchema, AntennaJson, CableChangeSchema, CableInputSchema, CableJson } from '../schemas/catalogue';

export type AntennaBody = z.input<typeof AntennaInputSchema>;
export type CableBody = z.input<typeof CableInputSchema>;

export const catalogueApi = {
  antennas: () => get<List<AntennaJson>>('/api/catalogue/antennas'),
  createAntenna: (body: AntennaBody) => request<AntennaJson>('POST', '/api/catalogue/antennas', body),
  updateAntenna: (id: string, change: z.input<typeof AntennaChangeSchema>) => request<AntennaJson>('PATCH', `/api/catalogue/antennas/${seg(id)}`, change),
  deleteAntenna: (id: string) => request<void>('DELETE', `/api/catalogue/antennas/${seg(id)}`),
  cables: () => get<List<CableJson>>('/api/catalogue/cables'),
  createCable: (body: CableBody) => request<CableJson>('POST', '/api/catalogue/cables', body),
  updateCable: (id: string, change: z.input<typeof CableChangeSchema>) => request<CableJson>('PATCH', `/api/catalogue/cables/${seg(id)}`, change),
  deleteCable: (id: string) => request<void>('DELETE', `/api/catalogue/cables/${seg(id)}`),
};
