import { describe, it, expect } from 'vitest';
import { checkHealth } from '../../src/lib/server/health';

describe('health', () => {
  it('reports PostgreSQL and PostGIS versions', async () => {
    const h = await checkHealth();
    expect(h.db).toMatch(/^PostgreSQL 1\d/);
    expect(h.postgis).toMatch(/^3\./);
  });
});
