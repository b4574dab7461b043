import { afterEach, describe, expect, it } from 'vitest';
import {
  clientAddressFrom,
  isLoopbackRequest,
  trustedProxyHops,
  UNKNOWN_ADDRESS,
} from '@/lib/server/client-address';

const h = (xff?: string) => new Headers(xff === undefined ? {} : { 'x-forwarded-for': xff });

describe('client address: forwarded headers believed only behind declared proxies', () => {
  const saved = { ...process.env };
  afterEach(() => {
    process.env = { ...saved };
  });

  it('ignores X-Forwarded-For without TRUST_PROXY (a client can write anything there)', () => {
    delete process.env.TRUST_PROXY;
    expect(trustedProxyHops()).toBe(0);
    expect(clientAddressFrom(h('203.0.113.7'))).toBe(UNKNOWN_ADDRESS);
    expect(clientAddressFrom(h())).toBe(UNKNOWN_ADDRESS);
  });

  it('takes the entry the trusted proxies appended, counting from the right', () => {
    process.env.TRUST_PROXY = '1';
    // The client forged the first entry; our one proxy appended the real peer.
    expect(clientAddressFrom(h('1.2.3.4, 198.51.100.20'))).toBe('198.51.100.20');
    process.env.TRUST_PROXY = '2';
    expect(clientAddressFrom(h('1.2.3.4, 198.51.100.20, 10.0.0.5'))).toBe('198.51.100.20');
    expect(clientAddressFrom(h('[2001:db8::1]:443'), 1)).toBe('2001:db8::1');
    expect(clientAddressFrom(h('not-an-address'), 1)).toBe(UNKNOWN_ADDRESS);
    process.env.TRUST_PROXY = 'banana';
    expect(trustedProxyHops()).toBe(0);
  });

  it('treats a request as loopback only when bound to loopback and, behind proxies, from loopback', () => {
    process.env.HOST = '127.0.0.1';
    delete process.env.TRUST_PROXY;
    expect(isLoopbackRequest(h())).toBe(true);
    process.env.TRUST_PROXY = '1';
    expect(isLoopbackRequest(h('198.51.100.20'))).toBe(false);
    expect(isLoopbackRequest(h('127.0.0.1'))).toBe(true);
    process.env.HOST = '0.0.0.0';
    expect(isLoopbackRequest(h('127.0.0.1'))).toBe(false);
  });
});
