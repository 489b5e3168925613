import request from 'supertest';
import { startHarness } from '../../../../test/support/api-harness';
import { instanceId } from './instance-id';

describe('GET /api/health', () => {
  it('reports ok with the database reachable', async () => {
    const h = await startHarness();
    try {
      const res = await request(h.created.app).get('/api/health');
      expect(res.status).toBe(200);
      expect(res.body).toMatchObject({ status: 'ok', database: 'reachable', instanceId });
    } finally {
      await h.close();
    }
  });

  it('reports the per-process instance id, also when degraded', async () => {
    expect(instanceId).toMatch(/\S{8,}/);
    const h = await startHarness({ PGPORT: 1 });
    try {
      const res = await request(h.created.app).get('/api/health');
      expect(res.body.instanceId).toBe(instanceId);
    } finally {
      await h.close();
    }
  });

  it('takes the instance id the launcher passed in SPINCYCLE_INSTANCE_ID', () => {
    const before = process.env.SPINCYCLE_INSTANCE_ID;
    process.env.SPINCYCLE_INSTANCE_ID = 'launcher-given-id-123';
    try {
      jest.isolateModules(() => {
        // eslint-disable-next-line @typescript-eslint/no-require-imports -- jest.isolateModules needs a synchronous load of a fresh copy
        const fresh = require('./instance-id') as typeof import('./instance-id');
        expect(fresh.instanceId).toBe('launcher-given-id-123');
      });
    } finally {
      if (before === undefined) delete process.env.SPINCYCLE_INSTANCE_ID;
      else process.env.SPINCYCLE_INSTANCE_ID = before;
    }
  });

  it('makes a random id when no launcher passed one', () => {
    const before = process.env.SPINCYCLE_INSTANCE_ID;
    delete process.env.SPINCYCLE_INSTANCE_ID;
    try {
      const ids = new Set<string>();
      for (let i = 0; i < 2; i++) {
        jest.isolateModules(() => {
          // eslint-disable-next-line @typescript-eslint/no-require-imports -- as above
          ids.add((require('./instance-id') as typeof import('./instance-id')).instanceId);
        });
      }
      expect(ids.size).toBe(2);
    } finally {
      if (before !== undefined) process.env.SPINCYCLE_INSTANCE_ID = before;
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
