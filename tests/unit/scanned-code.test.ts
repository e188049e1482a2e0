import { describe, expect, it } from 'vitest';
import { cameraProblem, plinthPathFromCode } from '../../app/lib/scanned-code.ts';

const ORIGIN = 'https://plinth.example';

describe('plinthPathFromCode', () => {
  it.each([
    ['https://plinth.example/performers/abc', '/performers/abc'],
    ['  https://plinth.example/performers/abc?tab=casts#photos \n', '/performers/abc?tab=casts#photos'],
    ['HTTPS://PLINTH.EXAMPLE/performers/abc', '/performers/abc'],
    ['/performers/abc', '/performers/abc'],
  ])('opens %j as %j', (code, path) => {
    expect(plinthPathFromCode(code, ORIGIN)).toBe(path);
  });

  it.each([
    ['another site', 'https://plinth.example.evil.test/performers/abc'],
    ['the same host on another port', 'https://plinth.example:8443/performers/abc'],
    ['plain http for an https Plinth', 'http://plinth.example/performers/abc'],
    ['a protocol-relative link elsewhere', '//evil.test/performers'],
    // WHATWG URL: a backslash counts as a slash in special schemes, so this names another host.
    ['a backslash trick', '/\\evil.test/performers'],
    ['a script link', 'javascript:alert(1)'],
    ['a server address', 'https://plinth.example/api/auth/logout'],
    ['the lent tablet screen', 'https://plinth.example/tablet'],
    ['a typed label code', 'R3-S2-B07'],
    ['nothing', '   '],
  ])('does not open %s', (_what, code) => {
    expect(plinthPathFromCode(code, ORIGIN)).toBeNull();
  });
});

describe('cameraProblem', () => {
  // The error names getUserMedia rejects with, per W3C Media Capture and Streams §10 (from memory).
  it.each([
    ['NotAllowedError', 'denied'],
    ['SecurityError', 'denied'],
    ['NotFoundError', 'no-camera'],
    ['OverconstrainedError', 'no-camera'],
    ['NotReadableError', 'busy'],
    ['AbortError', 'busy'],
    ['TypeError', 'failed'],
  ] as const)('%s means %s', (name, problem) => {
    expect(cameraProblem(new DOMException('camera', name))).toBe(problem);
  });

  it('treats anything without an error name as a plain failure', () => {
    expect(cameraProblem('no camera')).toBe('failed');
    expect(cameraProblem(null)).toBe('failed');
  });
});
