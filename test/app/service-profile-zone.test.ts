import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { type OpenedService, openService } from '../../src/main.ts';

// Invented people. Odile has no zone in the workspace, so her chat profile's zone is used.
const NOW = Date.parse('2026-12-01T12:00:00Z');
function workspace(): string {
  const dir = mkdtempSync(join(tmpdir(), 'slotwright-profile-zone-'));
  writeFileSync(
    join(dir, 'workspace.yaml'),
    [
      'name: Saltline Survey Cooperative (profile zone test)',
      'zone: Europe/Lisbon',
      'grid: 15',
      'admins: [ines]',
      'people:',
      '  - {id: ines, name: Ines Carvalhal, email: ines@saltline.example, zone: Europe/Lisbon}',
      '  - {id: odile, name: Odile Marsh, email: odile@saltline.example}',
      '',
    ].join('\n'),
  );
  return dir;
}

let opened: OpenedService | undefined;
afterEach(async () => {
  await opened?.close();
  opened = undefined;
});

describe('a chat profile zone for people the workspace gives none', () => {
  it("takes Odile's profile zone, keeps Ines's own, and schedules Odile in her working hours there", async () => {
    opened = await openService(workspace(), { now: () => NOW, database: ':memory:', pool: false });
    const s = opened.service;
    expect(s.person('odile')!.zone).toBe('Europe/Lisbon');
    const odile = await s.identify({
      chatId: 'U0ODILE01',
      email: 'odile@saltline.example',
      zone: 'America/Halifax',
    });
    expect(odile).toMatchObject({ ok: true, value: { id: 'odile', zone: 'America/Halifax' } });
    const ines = await s.identify({
      chatId: 'U0INES001',
      email: 'ines@saltline.example',
      zone: 'Asia/Tokyo',
    });
    expect(ines).toMatchObject({ ok: true, value: { id: 'ines', zone: 'Europe/Lisbon' } });
    expect(s.workspace.people.find((p) => p.id === 'odile')!.zone).toBe('America/Halifax');

    const r = await s.meet(
      s.person('odile')!,
      {
        lengthMinutes: 60,
        required: [{ kind: 'name', id: 'odile' }],
        optional: [],
        window: { from: '2026-12-09', to: '2026-12-09' },
        features: [],
      },
      NOW,
    );
    if (!r.ok) throw new Error(JSON.stringify(r.issues));
    expect(r.value.options.length).toBeGreaterThan(0);
    // 09:00-17:00 in Halifax is 13:00-21:00 UTC in December (UTC-4, IANA tz database).
    for (const o of r.value.options) {
      expect(o.start).toBeGreaterThanOrEqual(Date.parse('2026-12-09T13:00:00Z'));
      expect(o.end).toBeLessThanOrEqual(Date.parse('2026-12-09T21:00:00Z'));
    }
    expect(r.value.options.some((o) => o.start >= Date.parse('2026-12-09T17:00:00Z'))).toBe(true);
  });

  it('ignores a zone the runtime does not know', async () => {
    opened = await openService(workspace(), { now: () => NOW, database: ':memory:', pool: false });
    const r = await opened.service.identify({
      chatId: 'U0ODILE01',
      email: 'odile@saltline.example',
      zone: 'Mars/Olympus',
    });
    expect(r).toMatchObject({ ok: true, value: { id: 'odile', zone: 'Europe/Lisbon' } });
  });
});
