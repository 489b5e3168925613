import { assessProposal } from '@spincycle/shared/review/technical-assessment';
import { AssessmentCache, keepAssessment, type KeptAssessment } from './assessment-cache';

/** A distinct assessment per call: its target count is the call's number (no plans, so nothing else varies). */
function counter() {
  let calls = 0;
  const batches: number[][] = [];
  const compute = async (ids: number[]) => {
    calls++;
    batches.push([...ids]);
    await new Promise((r) => setTimeout(r, 5));
    const targets = Array.from({ length: calls }, (_, i) => ({ id: i + 1, name: `T${i + 1}` }));
    return new Map<number, KeptAssessment>(
      ids.map((id) => [id, keepAssessment(assessProposal({ targets, plans: [], campaignDays: 180, completenessGoal: 0.9 }))]),
    );
  };
  return { compute, batches, calls: () => calls };
}

describe('AssessmentCache', () => {
  it('computes each key once, in one batch for the proposals it misses, and keeps it', async () => {
    const cache = new AssessmentCache();
    const c = counter();
    const first = await cache.getMany(
      [
        { proposalId: 1, key: '1:0:0' },
        { proposalId: 2, key: '2:0:0' },
      ],
      c.compute,
    );
    expect(c.batches).toEqual([[1, 2]]);
    const again = await cache.getMany(
      [
        { proposalId: 2, key: '2:0:0' },
        { proposalId: 3, key: '3:0:0' },
      ],
      c.compute,
    );
    expect(c.batches).toEqual([[1, 2], [3]]);
    expect(again.get(2)).toBe(first.get(2));
    expect(cache.size).toBe(3);
  });

  it('a new key (a raised version) is computed again; a proposal without a key is computed every time and never kept', async () => {
    const cache = new AssessmentCache();
    const c = counter();
    const v1 = await cache.getMany([{ proposalId: 1, key: '1:0:0' }], c.compute);
    const v2 = await cache.getMany([{ proposalId: 1, key: '1:1:0' }], c.compute);
    expect(v1.get(1)!.summary.targetCount).toBe(1);
    expect(v2.get(1)!.summary.targetCount).toBe(2);
    await cache.getMany([{ proposalId: 5, key: undefined }], c.compute);
    await cache.getMany([{ proposalId: 5, key: undefined }], c.compute);
    expect(c.calls()).toBe(4);
    expect(cache.size).toBe(2);
  });

  it('concurrent requests missing the same key share one computation', async () => {
    const cache = new AssessmentCache();
    const c = counter();
    const [a, b] = await Promise.all([
      cache.getMany([{ proposalId: 1, key: '1:0:0' }], c.compute),
      cache.getMany(
        [
          { proposalId: 1, key: '1:0:0' },
          { proposalId: 2, key: '2:0:0' },
        ],
        c.compute,
      ),
    ]);
    expect(c.batches).toEqual([[1], [2]]);
    expect(b.get(1)).toBe(a.get(1));
  });

  it('a failed computation is not kept: the next request computes again', async () => {
    const cache = new AssessmentCache();
    await expect(cache.getMany([{ proposalId: 1, key: '1:0:0' }], () => Promise.reject(new Error('database down')))).rejects.toThrow(
      'database down',
    );
    const c = counter();
    expect((await cache.getMany([{ proposalId: 1, key: '1:0:0' }], c.compute)).get(1)!.summary.targetCount).toBe(1);
    expect(cache.size).toBe(1);
  });
});
