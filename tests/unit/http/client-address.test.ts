import { describe, expect, it } from 'vitest';
import { addressKey, forwardedChain, trustedProxyCount } from '@/lib/http/client-address';
import { clientAddress } from '@/lib/rate-limit';

// The "trusted hops" rule of reverse proxies (common practice; as in nginx's real_ip_recursive
// and Express's `trust proxy = N`): each proxy appends the address it heard from, so with N
// proxies of ours only the right-most N entries are theirs.
describe('forwardedChain', () => {
  it('with no trusted proxy, the socket replaces whatever the client wrote', () => {
    expect(forwardedChain('198.51.100.9', '1.2.3.4, 5.6.7.8', 0)).toEqual({ forwardedFor: '198.51.100.9', client: '198.51.100.9' });
    expect(forwardedChain('::ffff:127.0.0.1', undefined, 0)).toEqual({ forwardedFor: '127.0.0.1', client: '127.0.0.1' });
  });

  it('with one proxy, the last entry is the visitor and the rest are the visitor’s own claims', () => {
    expect(forwardedChain('10.0.0.2', 'spoofed, 203.0.113.5', 1)).toEqual({ forwardedFor: '203.0.113.5', client: '203.0.113.5' });
  });

  it('with two proxies, the second entry from the right is the visitor', () => {
    expect(forwardedChain('10.0.0.3', 'spoofed, 203.0.113.5, 10.0.0.2', 2)).toEqual({ forwardedFor: '203.0.113.5, 10.0.0.2', client: '203.0.113.5' });
  });

  it('a request that skipped the proxy falls back to the socket', () => {
    expect(forwardedChain('192.0.2.1', undefined, 1).client).toBe('192.0.2.1');
    expect(forwardedChain('192.0.2.1', ' , ', 1).client).toBe('192.0.2.1');
  });

  it('TRUSTED_PROXIES accepts only a small whole number', () => {
    expect(trustedProxyCount(undefined)).toBe(0);
    expect(trustedProxyCount('2')).toBe(2);
    expect(trustedProxyCount('-1')).toBe(0);
    expect(trustedProxyCount('1.5')).toBe(0);
    expect(trustedProxyCount('yes')).toBe(0);
  });
});

describe('rate-limit keys', () => {
  it('IPv6 addresses count per /64 (RFC 6177: a subscriber gets at least a /64)', () => {
    expect(addressKey('2001:db8:1:2:aaaa::1')).toBe('2001:db8:1:2::/64');
    expect(addressKey('2001:db8:1:2:ffff:1:2:3')).toBe('2001:db8:1:2::/64');
    expect(addressKey('2001:db8::1')).toBe('2001:db8:0:0::/64');
    expect(addressKey('::1')).toBe('0:0:0:0::/64');
    expect(addressKey('203.0.113.5')).toBe('203.0.113.5');
  });

  it('clientAddress reads what our server wrote', () => {
    expect(clientAddress(new Headers({ 'x-real-ip': '203.0.113.5', 'x-forwarded-for': '203.0.113.5' }))).toBe('203.0.113.5');
    expect(clientAddress({ 'x-forwarded-for': '2001:db8:1:2::9, 10.0.0.1' })).toBe('2001:db8:1:2::/64');
    expect(clientAddress({})).toBe('local');
  });
});
