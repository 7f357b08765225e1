// Which address a sign-in counts against: X-Forwarded-For only from configured proxies.
import { describe, expect, it } from 'vitest';
import { normaliseAddress, parseTrustedProxies, resolveClientAddress } from '../../server/forwarded.mjs';

describe('client address behind proxies', () => {
  const none = parseTrustedProxies('');
  const proxies = parseTrustedProxies('127.0.0.1, 10.0.0.0/8, fd00::/8');

  it('ignores X-Forwarded-For from a peer that is not a trusted proxy', () => {
    expect(resolveClientAddress('203.0.113.9', '1.2.3.4', none)).toBe('203.0.113.9');
    expect(resolveClientAddress('203.0.113.9', '1.2.3.4', proxies)).toBe('203.0.113.9');
    expect(resolveClientAddress('::ffff:203.0.113.9', undefined, none)).toBe('203.0.113.9');
  });

  it('takes the right-most hop that is not a trusted proxy', () => {
    expect(resolveClientAddress('127.0.0.1', '198.51.100.7', proxies)).toBe('198.51.100.7');
    // A client that writes its own header only adds hops on the left.
    expect(resolveClientAddress('127.0.0.1', '6.6.6.6, 198.51.100.7, 10.1.2.3', proxies)).toBe('198.51.100.7');
    expect(resolveClientAddress('10.0.0.5', ['6.6.6.6', '198.51.100.8'], proxies)).toBe('198.51.100.8');
  });

  it('stops at junk in the chain and falls back to what is known', () => {
    expect(resolveClientAddress('127.0.0.1', 'not-an-ip, 10.2.2.2', proxies)).toBe('10.2.2.2');
    expect(resolveClientAddress('127.0.0.1', '', proxies)).toBe('127.0.0.1');
  });

  it('refuses a malformed TRUSTED_PROXIES entry', () => {
    expect(() => parseTrustedProxies('10.0.0.0/40')).toThrow(/prefix/);
    expect(() => parseTrustedProxies('proxy.local')).toThrow(/not an IP/);
    expect(normaliseAddress('[::1]')).toBe('::1');
    expect(normaliseAddress('999.1.1.1')).toBeNull();
  });
});
