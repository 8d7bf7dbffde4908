import data from './zone-data/windows-zones.json' with { type: 'json' };

// Windows-style zone names (as some calendar servers write them in TZID) mapped to IANA names by
// the Unicode CLDR windowsZones table, territory "001" (the default zone of each Windows name).
const ZONES: Readonly<Record<string, string>> = data.zones;
const LOWER = new Map(Object.entries(ZONES).map(([k, v]) => [k.toLowerCase(), v]));

/** Where the Windows zone table comes from, for notices and reports. */
export const WINDOWS_ZONES_SOURCE: string = data.source;

/** The IANA zone CLDR maps a Windows zone name to (case-insensitive), or undefined. */
export function windowsZoneToIana(name: string): string | undefined {
  return ZONES[name] ?? LOWER.get(name.trim().toLowerCase());
}
