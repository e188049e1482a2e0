// Several API processes on one database count the same tries: the counters live in PostgreSQL.
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, type TestApp } from '../support/app.ts';

let a: TestApp;
let b: TestApp;
const token = 'Q'.repeat(43);
const hit = (t: TestApp, ip: string) => request(t.app).get(`/api/signing/${token}`).set('X-Forwarded-For', ip);

beforeAll(async () => {
  a = await createTestApp({ RATE_LIMITS: 'on', TRUST_PROXY: 'true' }, { seed: false });
  // A second app on the same database stands for a second process behind the load balancer.
  b = await createTestApp({ RATE_LIMITS: 'on', TRUST_PROXY: 'true' }, { seed: false, database: a.db.url });
});
afterAll(async () => {
  await b?.close();
  await a?.close();
});

describe('rate limits across processes', () => {
  it('one allowance per client address, whichever process answers', async () => {
    // The signing-link routes allow 30 a minute per address: 15 through each process.
    for (let i = 0; i < 15; i++) {
      expect((await hit(a, '203.0.113.20')).status).toBe(404);
      expect((await hit(b, '203.0.113.20')).status).toBe(404);
    }
    expect((await hit(a, '203.0.113.20')).status).toBe(429);
    expect((await hit(b, '203.0.113.20')).status).toBe(429);
    const row = await a.db.db.selectFrom('rate_limit_hits').select(['key', 'hits']).where('key', 'like', 'signing-links:%').executeTakeFirstOrThrow();
    expect(row.hits).toBe(32);
    // Another client has its own allowance.
    expect((await hit(b, '203.0.113.21')).status).toBe(404);
  });

  it('a window that has ended starts again from one', async () => {
    for (let i = 0; i < 31; i++) await hit(a, '203.0.113.30');
    expect((await hit(b, '203.0.113.30')).status).toBe(429);
    await a.db.db.updateTable('rate_limit_hits').set({ reset_at: new Date(Date.now() - 1000) }).where('key', 'like', '%203.0.113.30%').execute();
    const res = await hit(b, '203.0.113.30');
    expect(res.status).toBe(404);
    // The draft-8 RateLimit header reports what is left of the new window: 29 of 30.
    expect(String(res.headers['ratelimit'])).toMatch(/r=29\b/);
  });
});
