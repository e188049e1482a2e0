import type { AddressInfo } from 'node:net';
import { gzipSync } from 'node:zlib';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { redactUrl } from '../../api/http/errors.ts';
import { createTestApp, type TestApp } from '../support/app.ts';

let t: TestApp;
let head: string;
let production: string;
let juno: { id: string; version: number };

beforeAll(async () => {
  t = await createTestApp();
  head = await t.sessionFor('head@plinth.test');
  production = (await t.db.db.selectFrom('productions').select('id').where('name', '=', 'The Lantern Keeper').executeTakeFirstOrThrow()).id;
  juno = await t.db.db.selectFrom('performers').select(['id', 'version']).where('legal_name', '=', 'Juno Castellane').executeTakeFirstOrThrow();
});
afterAll(async () => {
  await t?.close();
});

describe('control characters in text', () => {
  it('refuses a NUL in a JSON body with 400 naming the field, and writes nothing', async () => {
    const res = await request(t.app)
      .post('/api/performers')
      .set('Cookie', head)
      .send({ legalName: 'A\u0000B', engagements: [{ productionId: production }] });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    expect(res.body.error.details.fields.legalName).toBeDefined();
    const made = await t.db.db.selectFrom('performers').select('id').where('legal_name', 'like', 'A%B').execute();
    expect(made).toHaveLength(0);
  });

  it('refuses a NUL in a query string with 400 naming the parameter', async () => {
    const res = await request(t.app).get('/api/performers?q=a%00b').set('Cookie', head);
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields.q).toBeDefined();
  });

  it('refuses a NUL inside a nested value (a questionnaire answer on a public signing link)', async () => {
    const res = await request(t.app)
      .post(`/api/signing/${'x'.repeat(43)}`)
      .send({ templateVersionId: '00000000-0000-4000-8000-000000000000', answers: { q1: 'yes\u0000' }, signerName: 'J', signaturePng: 'x', idempotencyKey: 'k' });
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields['answers.q1']).toBeDefined();
  });

  it('keeps tabs and new lines, which people do type', async () => {
    const res = await request(t.app)
      .patch(`/api/performers/${juno.id}`)
      .set('Cookie', head)
      .send({ legalName: 'Juno Castellane', notes: 'Line one\n\tLine two', engagements: [{ productionId: production, characterName: 'The Keeper' }], version: juno.version });
    expect(res.status).toBe(200);
    juno = { id: juno.id, version: res.body.version };
  });
});

describe('bodies Plinth cannot read', () => {
  it('answers 415 to JSON in a charset other than UTF-8', async () => {
    const res = await request(t.app).post('/api/performers').set('Cookie', head).set('Content-Type', 'application/json; charset=latin1').send('{"legalName":"X"}');
    expect(res.status).toBe(415);
    expect(res.body.error.code).toBe('unsupported_media_type');
  });

  it('answers 415 to an unknown content encoding', async () => {
    const res = await request(t.app).post('/api/performers').set('Cookie', head).set('Content-Type', 'application/json').set('Content-Encoding', 'x-unheard-of').send('{"legalName":"X"}');
    expect(res.status).toBe(415);
    expect(res.body.error.code).toBe('unsupported_media_type');
  });

  it('answers 400 to a body that claims gzip but is plain', async () => {
    const res = await request(t.app).post('/api/performers').set('Cookie', head).set('Content-Type', 'application/json').set('Content-Encoding', 'gzip').send('{"legalName":"X"}');
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
  });

  it('still reads a body that really is gzip-compressed', async () => {
    // A real socket: the test client would re-encode a binary body sent as JSON.
    const server = t.app.listen(0, '127.0.0.1');
    await new Promise((resolve) => server.once('listening', resolve));
    try {
      const { port } = server.address() as AddressInfo;
      const res = await fetch(`http://127.0.0.1:${port}/api/performers`, {
        method: 'POST',
        headers: { cookie: head, 'content-type': 'application/json', 'content-encoding': 'gzip' },
        body: gzipSync(Buffer.from(JSON.stringify({ legalName: '' }))),
      });
      const body = (await res.json()) as { error: { details: { fields: Record<string, string[]> } } };
      expect(res.status).toBe(400);
      expect(body.error.details.fields.legalName).toBeDefined();
    } finally {
      server.close();
    }
  });
});

describe('dates out of range', () => {
  it('refuses the year 0000 in an engagement date with 400, not a database error', async () => {
    const res = await request(t.app)
      .patch(`/api/performers/${juno.id}`)
      .set('Cookie', head)
      .send({ legalName: 'Juno Castellane', engagements: [{ productionId: production, startsOn: '0000-01-01' }], version: juno.version });
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields['engagements.0.startsOn']).toBeDefined();
  });

  it('refuses the year 0000 in a session time', async () => {
    const res = await request(t.app).post('/api/bookings').set('Cookie', head).send({ performerId: juno.id, productionId: production, purpose: 'life_cast', startsAt: '0000-01-01T10:00:00Z' });
    expect(res.status).toBe(400);
    expect(res.body.error.details.fields.startsAt).toBeDefined();
  });
});

describe('log lines never carry one-time tokens', () => {
  it('redacts token path segments and query strings', () => {
    const token = 'AbCdEfGhIjKlMnOpQrStUvWxYz0123456789_-abcdefg';
    for (const url of [`/api/signing/${token}`, `/api/withdrawal-links/${token}/withdraw`, `/api/email-confirmations/${token}`, `/api/account-invitations/${token}/accept`]) {
      expect(redactUrl(url)).not.toContain(token);
      expect(redactUrl(url)).toContain('[redacted]');
    }
    expect(redactUrl(`/api/performers?q=${token}`)).toBe('/api/performers?[redacted]');
    expect(redactUrl('/api/performers/123')).toBe('/api/performers/123');
  });

  it('a failing request on a token route logs the route without the token', async () => {
    const token = 'ZZ'.repeat(22);
    const before = t.logs.length;
    // A request that fails deep inside (the database connection is cut for this one query).
    const original = t.ctx.db.selectFrom.bind(t.ctx.db);
    (t.ctx.db as unknown as { selectFrom: unknown }).selectFrom = () => {
      throw new Error('boom');
    };
    try {
      const res = await request(t.app).get(`/api/signing/${token}?x=${token}`);
      expect(res.status).toBe(500);
    } finally {
      (t.ctx.db as unknown as { selectFrom: unknown }).selectFrom = original;
    }
    const logged = t.logs.slice(before);
    expect(logged.length).toBeGreaterThan(0);
    expect(logged.join('\n')).not.toContain(token);
  });
});
