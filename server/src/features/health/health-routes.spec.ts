import request from 'supertest';
import { startHarness } from '../../../../test/support/api-harness';

describe('GET /api/health', () => {
  it('reports ok with the database reachable', async () => {
    const h = await startHarness();
    try {
      const res = await request(h.created.app).get('/api/health');
      expect(res.status).toBe(200);
      expect(res.body).toMatchObject({ status: 'ok', database: 'reachable' });
    } finally {
      await h.close();
    }
  });

  it('reports 503 degraded when PostgreSQL does not answer', async () => {
    const h = await startHarness({ PGPORT: 1 });
    try {
      const res = await request(h.created.app).get('/api/health');
      expect(res.status).toBe(503);
      expect(res.body).toMatchObject({ status: 'degraded', database: 'unreachable' });
    } finally {
      await h.close();
    }
  });
});
