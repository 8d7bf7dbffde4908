import { describe, expect, it } from 'vitest';
import { windowsZoneToIana } from '../../src/time/windows-zones.ts';
import { canonicalZone } from '../../src/time/zoned.ts';

// Unicode CLDR common/supplemental/windowsZones.xml, territory "001" rows (for example
// <mapZone other="Atlantic Standard Time" territory="001" type="America/Halifax"/>).
const CLDR_001: readonly (readonly [string, string])[] = [
  ['Atlantic Standard Time', 'America/Halifax'],
  ['GMT Standard Time', 'Europe/London'],
  ['New Zealand Standard Time', 'Pacific/Auckland'],
  ['Eastern Standard Time', 'America/New_York'],
  ['Pacific Standard Time', 'America/Los_Angeles'],
  ['W. Europe Standard Time', 'Europe/Berlin'],
  ['Romance Standard Time', 'Europe/Paris'],
  ['Tokyo Standard Time', 'Asia/Tokyo'],
  ['AUS Eastern Standard Time', 'Australia/Sydney'],
  ['India Standard Time', 'Asia/Calcutta'],
  ['China Standard Time', 'Asia/Shanghai'],
  ['Newfoundland Standard Time', 'America/St_Johns'],
  ['Azores Standard Time', 'Atlantic/Azores'],
  ['Chatham Islands Standard Time', 'Pacific/Chatham'],
  ['UTC', 'Etc/UTC'],
];

describe('Windows zone names through CLDR windowsZones', () => {
  for (const [windows, iana] of CLDR_001) {
    it(`maps '${windows}' to ${iana}`, () => {
      expect(windowsZoneToIana(windows)).toBe(iana);
      // the runtime's zone data knows every mapped name (CLDR sometimes uses older aliases)
      expect(canonicalZone(iana)).toBeDefined();
    });
  }
  it('ignores letter case and surrounding spaces', () => {
    expect(windowsZoneToIana(' atlantic standard time ')).toBe('America/Halifax');
  });
  it('returns undefined for names it does not know', () => {
    expect(windowsZoneToIana('Middle Earth Standard Time')).toBeUndefined();
  });
});
