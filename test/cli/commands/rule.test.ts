import { describe, expect, it } from 'vitest';
import type { CliIo } from '../../../src/cli/io.ts';
import { runCli } from '../../../src/cli/main.ts';

function recorder(env: Record<string, string | undefined> = {}): CliIo & { outs: string[]; errs: string[] } {
  const outs: string[] = [];
  const errs: string[] = [];
  return {
    outs,
    errs,
    out: (t) => outs.push(t),
    err: (t) => errs.push(t),
    env,
    isTty: false,
    now: () => Date.parse('2026-12-01T12:00:00Z'),
  };
}

describe('slotwright rule', () => {
  it('prints one JSON object with the rule and its sentence', async () => {
    const io = recorder();
    const code = await runCli(
      ['rule', "I'm out the 21st to the 2nd", '--zone', 'Europe/Lisbon', '--json'],
      io,
    );
    expect(code).toBe(0);
    expect(io.outs).toHaveLength(1);
    expect(JSON.parse(io.outs[0]!)).toEqual({
      rule: {
        subject: { kind: 'speaker' },
        strength: 'hard',
        body: { kind: 'dates', mode: 'avoid', from: '2026-12-21', to: '2027-01-02' },
      },
      text: 'No meetings from 2026-12-21 to 2027-01-02',
    });
  });

  it('reads relative dates from --now in --zone', async () => {
    const io = recorder();
    const code = await runCli(
      ['rule', "I'm off tomorrow", '--zone', 'Pacific/Auckland', '--now', '2026-12-01T23:30:00Z', '--json'],
      io,
    );
    expect(code).toBe(0);
    expect(JSON.parse(io.outs[0]!).text).toBe('No meetings on 2026-12-03');
  });

  it('prints the sentence and the structure as text', async () => {
    const io = recorder({ TZ: 'America/Halifax' });
    expect(await runCli(['rule', 'keep tuesday mornings free'], io)).toBe(0);
    expect(io.outs.slice(0, 7)).toEqual([
      'Keep Tuesday mornings free',
      '  for                you',
      '  strength           hard rule (must hold)',
      '  kind               keep free',
      '  days               Tue',
      '  hours              morning',
      '  zone               your own zone',
    ]);
  });

  it('exits 1 with the error and suggestions as JSON', async () => {
    const io = recorder();
    expect(await runCli(['rule', 'no meetings before 9', '--json'], io)).toBe(1);
    expect(JSON.parse(io.outs[0]!)).toEqual({
      error: "'before 9' could mean before 9am or before 9pm; say which (with am/pm or as 24-hour time)",
      suggestions: ['no meetings before 9am', 'no meetings before 9pm'],
    });
  });

  it('exits 1 with a readable error on stderr', async () => {
    const io = recorder();
    expect(await runCli(['rule', 'no meetings when it rains'], io)).toBe(1);
    expect(io.errs[0]).toBe(
      "slotwright rule: I could not read 'when it rains' in 'no meetings when it rains'",
    );
    expect(io.errs[1]).toMatch(/^Sentences I can read: "No meetings before 10am"/);
  });

  it('exits 2 on bad arguments', async () => {
    for (const args of [
      ['rule'],
      ['rule', 'a', 'b'],
      ['rule', 'no meetings before 10am', '--zone', 'Mars/Olympus'],
      ['rule', 'no meetings before 10am', '--now', 'yesterday'],
      ['rule', 'no meetings before 10am', '--colour'],
    ]) {
      const io = recorder();
      expect(await runCli(args, io), args.join(' ')).toBe(2);
      expect(io.errs).toHaveLength(1);
    }
    const io = recorder();
    await runCli(['rule', 'x', '--zone', 'Mars/Olympus'], io);
    expect(io.errs[0]).toBe(
      "slotwright rule: --zone takes an IANA time-zone name such as Europe/Lisbon, got 'Mars/Olympus'",
    );
  });
});
