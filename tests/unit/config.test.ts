import { describe, expect, it } from 'vitest';
import { ConfigError, parseConfig } from '../../api/config.ts';

describe('parseConfig', () => {
  it('has working defaults for a local start', () => {
    const c = parseConfig({});
    expect(c.port).toBe(3000);
    expect(c.appOrigin).toBe('http://127.0.0.1:3000');
    expect(c.oidc.issuer).toBe('http://127.0.0.1:3001');
    expect(c.oidc.redirectUri).toBe('http://127.0.0.1:3000/api/auth/callback');
    expect(c.smtpUrl).toBe('smtp://127.0.0.1:2525');
    expect(c.dbPort).toBe(54329);
  });
  it('derives the origin from PORT and the callback from the origin', () => {
    const c = parseConfig({ PORT: '4100' });
    expect(c.appOrigin).toBe('http://127.0.0.1:4100');
    expect(parseConfig({ APP_ORIGIN: 'https://plinth.example.test/' }).oidc.redirectUri).toBe('https://plinth.example.test/api/auth/callback');
  });
  it('keeps files on the local disk unless an S3-compatible bucket is chosen', () => {
    const local = parseConfig({ STORAGE_DIR: '/srv/plinth-files' });
    expect(local.files).toEqual({ driver: 'local', dir: '/srv/plinth-files' });
    const s3 = parseConfig({ FILE_STORE: 's3', S3_BUCKET: 'studio-files', S3_ENDPOINT: 'https://objects.example.test', S3_ACCESS_KEY_ID: 'id', S3_SECRET_ACCESS_KEY: 'secret', S3_PREFIX: 'plinth/' });
    expect(s3.files).toEqual({
      driver: 's3',
      bucket: 'studio-files',
      endpoint: 'https://objects.example.test',
      region: 'us-east-1',
      credentials: { accessKeyId: 'id', secretAccessKey: 'secret' },
      forcePathStyle: true,
      prefix: 'plinth/',
    });
    // AWS itself: virtual-hosted buckets and the default credential chain.
    expect(parseConfig({ FILE_STORE: 's3', S3_BUCKET: 'studio-files', S3_REGION: 'eu-west-2' }).files).toMatchObject({ endpoint: null, credentials: null, forcePathStyle: false, region: 'eu-west-2' });
  });
  it('refuses an S3 store without a bucket, or with half a key pair', () => {
    expect(() => parseConfig({ FILE_STORE: 's3' })).toThrow(/S3_BUCKET must name the bucket/);
    expect(() => parseConfig({ FILE_STORE: 's3', S3_BUCKET: 'studio-files', S3_ACCESS_KEY_ID: 'id' })).toThrow(/S3_SECRET_ACCESS_KEY must be set together/);
    expect(() => parseConfig({ FILE_STORE: 's3', S3_BUCKET: 'Studio_Files' })).toThrow(/S3_BUCKET must be a bucket name/);
    expect(() => parseConfig({ FILE_STORE: 'nfs' })).toThrow(/FILE_STORE/);
  });
  it('names every bad variable in one error', () => {
    try {
      parseConfig({ PORT: 'abc', OIDC_ISSUER: 'not a url', SESSION_SECRET: 'short' });
      expect.unreachable();
    } catch (err) {
      expect(err).toBeInstanceOf(ConfigError);
      const msg = (err as Error).message;
      expect(msg).toContain('PORT');
      expect(msg).toContain('OIDC_ISSUER');
      expect(msg).toContain('SESSION_SECRET');
    }
  });
  it('refuses the development session secret in production without the local fakes', () => {
    expect(() => parseConfig({ NODE_ENV: 'production', START_FAKES: 'false' })).toThrow(/SESSION_SECRET/);
  });
  it('refuses the development session secret in production even with the local fakes asked for', () => {
    expect(() => parseConfig({ NODE_ENV: 'production', START_FAKES: 'true' })).toThrow(/SESSION_SECRET/);
    expect(() => parseConfig({ NODE_ENV: 'production' })).toThrow(/SESSION_SECRET/);
  });
  it('never starts the development fakes in production, and says so if asked to', () => {
    const secret = 'a-production-secret-of-at-least-32-chars!';
    expect(parseConfig({ NODE_ENV: 'production', SESSION_SECRET: secret }).startFakes).toBe(false);
    expect(() => parseConfig({ NODE_ENV: 'production', SESSION_SECRET: secret, START_FAKES: 'true' })).toThrow(/START_FAKES/);
    expect(parseConfig({}).startFakes).toBe(true);
    expect(parseConfig({ START_FAKES: 'false' }).startFakes).toBe(false);
  });
  it('runs background jobs except under test, in the studio time zone, which must be a real one', () => {
    expect(parseConfig({}).jobs).toBe(true);
    expect(parseConfig({ NODE_ENV: 'test' }).jobs).toBe(false);
    expect(parseConfig({ NODE_ENV: 'test', JOBS: 'on' }).jobs).toBe(true);
    expect(parseConfig({}).timeZone).toBe('Europe/London');
    expect(() => parseConfig({ TIME_ZONE: 'Mars/Olympus_Mons' })).toThrow(/TIME_ZONE/);
  });
  it('treats empty variables as unset', () => {
    expect(parseConfig({ PORT: '' }).port).toBe(3000);
  });
});

describe('identity provider address', () => {
  it('refuses a plain-http issuer that is not on this machine', () => {
    expect(() => parseConfig({ OIDC_ISSUER: 'http://login.example.org' })).toThrow(/OIDC_ISSUER/);
    expect(parseConfig({ OIDC_ISSUER: 'http://127.0.0.1:4001' }).oidc.issuer).toBe('http://127.0.0.1:4001');
    expect(parseConfig({ OIDC_ISSUER: 'https://login.example.org' }).oidc.issuer).toBe('https://login.example.org');
  });
});
