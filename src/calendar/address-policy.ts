import ipaddr from 'ipaddr.js';

// Well-known cloud instance-metadata addresses, named so a refusal says what it protected.
const METADATA = new Map([
  ['169.254.169.254', 'cloud metadata'],
  ['fd00:ec2::254', 'cloud metadata'],
  ['100.100.100.200', 'cloud metadata'],
  ['192.0.0.192', 'cloud metadata'],
]);

/**
 * Why an IP address must not be fetched from, or undefined when it is an ordinary public unicast
 * address. IPv4-mapped IPv6 addresses are judged as the IPv4 address they carry; every ipaddr.js
 * range other than `unicast` (private, loopback, linkLocal, uniqueLocal, multicast, unspecified,
 * broadcast, reserved, carrierGradeNat, 6to4, teredo, rfc6052, ...) is refused.
 */
export function refusedAddressReason(address: string): string | undefined {
  let parsed: ipaddr.IPv4 | ipaddr.IPv6;
  try {
    parsed = ipaddr.process(address.replace(/^\[|\]$/g, '').replace(/%.*$/, ''));
  } catch {
    return 'not an IP address';
  }
  const normal = parsed.toNormalizedString();
  const named = METADATA.get(normal) ?? METADATA.get(parsed.toString());
  if (named !== undefined) return named;
  const range = parsed.range();
  return range === 'unicast' ? undefined : range;
}

/** True when `host` is an IP literal (IPv4 dotted quad or IPv6, brackets allowed). */
export function isIpLiteral(host: string): boolean {
  return ipaddr.isValid(host.replace(/^\[|\]$/g, ''));
}
