import { describe, expect, it } from 'vitest';
import { runConsole, writeTestWorkspace } from './support.ts';

describe('terminal console driven by piped input', () => {
  it('meets, books once, takes a rule that changes the options, and explains what blocks a request', async () => {
    const ws = writeTestWorkspace();
    const r = await runConsole(
      ['--workspace', ws, '--now', '2026-12-07T09:00:00Z'],
      [
        'meet 30m with @teo @rui tomorrow',
        '1',
        '1',
        'rule no meetings after 15:00',
        '12',
        'meet 30m with @teo @rui tomorrow',
        'meet 8h with @teo tomorrow',
        'why',
        'meet 30m with @nobody',
      ],
    );
    expect(r.err).toBe('');
    expect(r.code).toBe(0);
    const lines = r.out.split('\n').filter((l) => !l.startsWith('  (fit'));
    // No prompt is printed when standard input is not a terminal.
    expect(lines[0]).toBe(
      "slotwright console · Saltline Survey Cooperative (test) · you are Ines Carvalhal (@ines, Europe/Lisbon). Type 'help' for what I can do.",
    );
    // Times are shown on the viewer's wall clock (Lisbon is UTC+0 in December, IANA tz database).
    // Tuesday in everyone's hours: Halifax 09:00-17:00 is 13:00-21:00 UTC; Teo is busy 13:00-14:00 UTC.
    expect(lines.slice(1, 5)).toEqual([
      'Options for 30 min with Ines, Teo, Rui',
      '1. Tue 2026-12-08 14:00–14:30',
      '  [1] Book option 1',
      '  [2] Hold option 1',
    ]);
    const at = (s: string) => lines.indexOf(s);
    expect(at('> Book option 1')).toBeGreaterThan(0);
    expect(lines[at('> Book option 1') + 1]).toBe(
      'Booked: Tue 2026-12-08 14:00–14:30 with Ines Carvalhal, Rui Teixo, Teo Brannigan · booked',
    );
    expect(lines[at('> Book option 1') + 2]).toBe('  [11] Cancel booking');
    expect(lines[at('> Book option 1') + 3]).toBe('Choice 1 was already carried out.');
    expect(lines).toContain('I read this as a hard rule (must): No meetings after 3pm');
    expect(lines).toContain('  [12] Save this rule');
    const saved = lines.find((l) => l.startsWith('Saved rule '));
    expect(saved).toMatch(/^Saved rule r[0-9a-f]{6}: No meetings after 3pm$/);
    // The second answer: 14:00 is booked now, and nothing may end after 15:00 Lisbon time.
    const second = lines.slice(at(saved!) + 1);
    expect(second.slice(0, 5)).toEqual([
      'Options for 30 min with Ines, Teo, Rui',
      '1. Tue 2026-12-08 14:30–15:00',
      '  [13] Book option 1',
      '  [14] Hold option 1',
      'Nothing fits for 8 h with Ines, Teo.',
    ]);
    expect(lines).toContain('In the way:');
    expect(lines).toContain('What limited your last request (8 h with Ines, Teo):');
    const why = lines.slice(at('What limited your last request (8 h with Ines, Teo):') + 1);
    // Blockers are named plainly, each with the person and what of theirs is in the way.
    expect(why.slice(0, 2)).toEqual([
      "  - Ines Carvalhal: ines's calendar",
      "  - Ines Carvalhal: ines's working hours (09:00-17:00 Europe/Lisbon)",
    ]);
    expect(lines.slice(-3)).toEqual([
      'I could not work on that request. Nothing was booked.',
      '  - @nobody is not a person or group of this workspace',
      '',
    ]);
  });

  it('refuses an unknown --as person and a bad --now with a clear message', async () => {
    const ws = writeTestWorkspace();
    const a = await runConsole(['--workspace', ws, '--as', 'zed'], []);
    expect(a.code).toBe(2);
    expect(a.err).toContain("--as 'zed' is not a person of the workspace; people: ines, teo, rui, lena");
    const b = await runConsole(['--workspace', ws, '--now', 'tomorrow'], []);
    expect(b.code).toBe(2);
    expect(b.err).toContain(
      "--now takes an instant with a zone offset, e.g. 2026-12-07T09:00:00Z, got 'tomorrow'",
    );
  });
});
