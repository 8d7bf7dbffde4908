import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { SLOT_COMMAND } from '../../src/bot/listeners/commands/index.ts';

const root = join(import.meta.dirname, '..', '..');
const manifest = JSON.parse(readFileSync(join(root, 'manifest.json'), 'utf8')) as {
  features: {
    slash_commands: { command: string; url: string; should_escape: boolean }[];
    app_home: Record<string, boolean>;
  };
  oauth_config: { scopes: { bot: string[] } };
  settings: {
    event_subscriptions: { request_url: string; bot_events: string[] };
    interactivity: { request_url: string };
  };
};
const readme = readFileSync(join(root, 'README.md'), 'utf8');

describe('app manifest', () => {
  it('asks for exactly the scopes the README justifies', () => {
    // Only the scopes table: it starts at the sentence that introduces it and ends at the next blank line.
    const table = readme.slice(readme.indexOf('Scopes the manifest asks for')).split('\n\n')[1] ?? '';
    const justified = [...table.matchAll(/^\| `([a-z_:.]+)` \|/gm)].map((m) => m[1]);
    expect(justified.length).toBeGreaterThan(0);
    expect([...manifest.oauth_config.scopes.bot].sort()).toEqual([...justified].sort());
  });

  it('routes the slash command, events and buttons to the path the app serves', () => {
    expect(manifest.features.slash_commands.map((c) => c.command)).toEqual([SLOT_COMMAND]);
    // Escaped mentions (<@U123|name>) are what the command parser reads.
    expect(manifest.features.slash_commands[0]!.should_escape).toBe(true);
    const urls = [
      manifest.features.slash_commands[0]!.url,
      manifest.settings.event_subscriptions.request_url,
      manifest.settings.interactivity.request_url,
    ];
    for (const u of urls) expect(new URL(u).pathname).toBe('/slack/events');
  });

  it('subscribes to the events the listeners handle, and each needs a requested scope', () => {
    expect([...manifest.settings.event_subscriptions.bot_events].sort()).toEqual([
      'app_home_opened',
      'app_mention',
      'message.im',
    ]);
    const scopes = manifest.oauth_config.scopes.bot;
    expect(scopes).toContain('app_mentions:read'); // app_mention
    expect(scopes).toContain('im:history'); // message.im
    expect(manifest.features.app_home.home_tab_enabled).toBe(true);
  });
});
