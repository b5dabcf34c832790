import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { jsonDepth } from '../../../server/errors';
import { delayAfter, addressKey } from '../../../server/services/signIn';

/** The nesting depth of a parsed JSON value: the reference the byte scanner must agree with. */
const depthOf = (v: unknown): number => (v && typeof v === 'object' ? 1 + Math.max(0, ...Object.values(v as object).map(depthOf)) : 0);

describe('JSON depth before parsing', () => {
  it('agrees with the depth of the parsed value for any JSON, brackets in strings included', () => {
    fc.assert(fc.property(fc.jsonValue({ maxDepth: 8 }), (v) => jsonDepth(Buffer.from(JSON.stringify(v))) === depthOf(v)));
  });
  it('stops counting past the limit', () => {
    expect(jsonDepth(Buffer.from('['.repeat(100000)), 40)).toBe(41);
  });
});

describe('sign-in delays', () => {
  it.each([
    [4, 5, 900, 0],
    [5, 5, 900, 1],
    [6, 5, 900, 2],
    [9, 5, 900, 16],
    [30, 5, 900, 900],
  ])('after %i failures (free %i, cap %i) waits %i units', (n, free, cap, expected) => {
    expect(delayAfter(n, free, cap)).toBe(expected);
  });
  it('keys IPv4 addresses as they are and IPv6 ones by their /64', () => {
    expect(addressKey('::ffff:203.0.113.9')).toBe('203.0.113.9');
    expect(addressKey('2001:db8:1:2:aaaa:bbbb:cccc:dddd')).toBe('2001:db8:1:2::/64');
    expect(addressKey('2001:db8::1')).toBe('2001:db8:0:0::/64');
  });
});
