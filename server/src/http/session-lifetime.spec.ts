import session from 'express-session';
import { storeSignedInSessionsOnly, throttleSessionTouch } from './session-lifetime';

/** A memory store that counts writes (express-session's MemoryStore implements touch). */
function countingStore() {
  const store = new session.MemoryStore();
  const writes = { touch: 0, set: 0, destroy: 0 };
  const touch = store.touch.bind(store);
  const set = store.set.bind(store);
  const destroy = store.destroy.bind(store);
  store.touch = (sid, sess, cb) => {
    writes.touch++;
    touch(sid, sess, cb);
  };
  store.set = (sid, sess, cb) => {
    writes.set++;
    set(sid, sess, cb);
  };
  store.destroy = (sid, cb) => {
    writes.destroy++;
    destroy(sid, cb);
  };
  return { store, writes };
}

const signedIn = () => ({ cookie: { originalMaxAge: 3600_000, expires: new Date(Date.now() + 3600_000) }, passport: { user: 7 } }) as never;
const call = (fn: (cb: (err?: unknown) => void) => void) =>
  new Promise<void>((resolve, reject) => fn((err) => (err ? reject(err) : resolve())));

describe('throttleSessionTouch', () => {
  it('renews a session in the store at most once per interval, and again after it', async () => {
    let t = 1_000_000;
    const { store, writes } = countingStore();
    storeSignedInSessionsOnly(store, () => new Date(t));
    throttleSessionTouch(store, 60_000, () => new Date(t));
    await call((cb) => store.set('a', signedIn(), cb));
    for (let i = 0; i < 5; i++) {
      t += 5_000;
      await call((cb) => store.touch!('a', signedIn(), cb));
    }
    expect(writes.touch).toBe(0); // the save 25 s ago counts as the renewal
    t += 40_000;
    await call((cb) => store.touch!('a', signedIn(), cb));
    await call((cb) => store.touch!('a', signedIn(), cb));
    expect(writes.touch).toBe(1);
  });

  it('writes a destroyed and re-created session afresh; separate sessions are throttled apart', async () => {
    let t = 0;
    const { store, writes } = countingStore();
    throttleSessionTouch(store, 60_000, () => new Date(t));
    await call((cb) => store.touch!('a', signedIn(), cb));
    await call((cb) => store.touch!('b', signedIn(), cb));
    expect(writes.touch).toBe(2);
    await call((cb) => store.destroy('a', cb));
    t += 1_000;
    await call((cb) => store.touch!('a', signedIn(), cb));
    await call((cb) => store.touch!('b', signedIn(), cb));
    expect(writes.touch).toBe(3);
  });

  it('with an interval of 0 writes every touch (the old behaviour)', async () => {
    const { store, writes } = countingStore();
    throttleSessionTouch(store, 0, () => new Date(0));
    for (let i = 0; i < 3; i++) await call((cb) => store.touch!('a', signedIn(), cb));
    expect(writes.touch).toBe(3);
  });
});
