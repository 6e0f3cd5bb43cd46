// The server entry's decisions, as pure functions: client address, HTTPS, time limits, headers.
import { describe, expect, it } from 'vitest';
import { cameOverHttps, decideClientAddress, routeTimeoutMs, securityHeaders } from '../../scripts/lib/http-policy.mjs';

const req = (remoteAddress: string, headers: Record<string, string> = {}, encrypted = false) =>
  ({ socket: { remoteAddress, encrypted }, headers }) as never;

describe('decideClientAddress', () => {
  it('takes the socket address and ignores X-Forwarded-For when no proxy is trusted', () => {
    expect(decideClientAddress(req('10.1.2.3', { 'x-forwarded-for': '203.0.113.9' }), false)).toBe('10.1.2.3');
  });

  it('writes an IPv4 address mapped into IPv6 as IPv4', () => {
    expect(decideClientAddress(req('::ffff:127.0.0.1'), false)).toBe('127.0.0.1');
  });

  it('behind a trusted proxy takes the last X-Forwarded-For entry, the one the proxy appended', () => {
    const spoofed = req('10.0.0.1', { 'x-forwarded-for': '198.51.100.7, 192.0.2.44' });
    expect(decideClientAddress(spoofed, true)).toBe('192.0.2.44');
  });

  it('behind a trusted proxy falls back to the socket when the header is missing or not an address', () => {
    expect(decideClientAddress(req('10.0.0.1'), true)).toBe('10.0.0.1');
    expect(decideClientAddress(req('10.0.0.1', { 'x-forwarded-for': 'not-an-ip' }), true)).toBe('10.0.0.1');
  });
});

describe('cameOverHttps', () => {
  it('is true for a TLS socket', () => expect(cameOverHttps(req('1.2.3.4', {}, true), false)).toBe(true));
  it('believes X-Forwarded-Proto only from a trusted proxy', () => {
    expect(cameOverHttps(req('1.2.3.4', { 'x-forwarded-proto': 'https' }), false)).toBe(false);
    expect(cameOverHttps(req('1.2.3.4', { 'x-forwarded-proto': 'https' }), true)).toBe(true);
    expect(cameOverHttps(req('1.2.3.4', { 'x-forwarded-proto': 'http' }), true)).toBe(false);
  });
});

describe('routeTimeoutMs', () => {
  const table = [{ prefix: '/api/uploads', ms: 120_000 }];
  it('gives a route in the table its own limit and everything else the default', () => {
    expect(routeTimeoutMs('/api/uploads/abc?x=1', 30_000, table)).toBe(120_000);
    expect(routeTimeoutMs('/api/uploads', 30_000, table)).toBe(120_000);
    expect(routeTimeoutMs('/api/uploadsX', 30_000, table)).toBe(30_000);
    expect(routeTimeoutMs('/api/sync', 30_000, table)).toBe(30_000);
  });
});

describe('securityHeaders', () => {
  it('forbids framing and sniffing and allows no inline script', () => {
    const h = securityHeaders();
    expect(h['Content-Security-Policy']).toContain("frame-ancestors 'none'");
    expect(h['Content-Security-Policy']).not.toContain('unsafe-inline');
    expect(h['X-Content-Type-Options']).toBe('nosniff');
    expect(h['Referrer-Policy']).toBe('same-origin');
    expect(h).not.toHaveProperty('Strict-Transport-Security');
  });
  it('adds HSTS only when asked', () => {
    expect(securityHeaders({ hsts: true })['Strict-Transport-Security']).toMatch(/^max-age=\d+/);
  });
});
