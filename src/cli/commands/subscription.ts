import { SlotwrightError } from '../../errors.ts';
import { openService } from '../../main.ts';
import { parseVerbArgs, stringOption } from '../args.ts';
import { UsageError } from '../io.ts';
import type { CliCommand } from '../main.ts';

const USAGE = `Usage: slotwright subscription --workspace <dir> (--person <id> | --room <id>) [--base <url>] [--json]

Makes a private subscription address for one person's or room's bookings (an .ics calendar that
calendar programs can subscribe to). Anyone holding the address can read that calendar: hand it only
to its owner. Only a hash of the token is stored, so the address is shown once.

  --workspace  folder with workspace.yaml
  --person     the person whose bookings the calendar shows (titles of their meetings)
  --room       the room whose bookings the calendar shows ("Booked" only)
  --base       public address of the running app (default http://localhost:$PORT, PORT 3000)
  --json       print JSON

The running app serves the address in HTTP mode on its own port, under /feeds/.
Store: SLOTWRIGHT_DATABASE_URL, else data/slotwright.sqlite under the current folder.
Exit codes: 0 made, 1 unknown person or room or unreadable input, 2 bad arguments.`;

/** `slotwright subscription`: issues a subscription-feed address for a person or room. */
export const command: CliCommand = {
  name: 'subscription',
  summary: "make a private calendar address of a person's or room's bookings",
  usage: USAGE,
  async run(args, io) {
    const { values } = parseVerbArgs(args, {
      workspace: { type: 'string' },
      person: { type: 'string' },
      room: { type: 'string' },
      base: { type: 'string' },
      json: { type: 'boolean' },
    });
    const person = stringOption(values, 'person');
    const room = stringOption(values, 'room');
    if ((person === undefined) === (room === undefined))
      throw new UsageError('give exactly one of --person or --room');
    const base = (stringOption(values, 'base') ?? `http://localhost:${io.env.PORT ?? '3000'}`).replace(
      /\/+$/,
      '',
    );
    if (!/^https?:\/\/[^/\s]+(\/\S*)?$/.test(base))
      throw new UsageError(`--base takes an http(s) address such as https://slot.example.org, got '${base}'`);
    const owner =
      person === undefined ? { kind: 'room' as const, id: room! } : { kind: 'person' as const, id: person };
    // the same service the running app serves the feeds from checks the owner and stores the token hash
    const opened = await openService(stringOption(values, 'workspace', true), {
      now: io.now,
      pool: false,
      ...(io.env.SLOTWRIGHT_DATABASE_URL === undefined ? {} : { database: io.env.SLOTWRIGHT_DATABASE_URL }),
    });
    try {
      const url = `${base}/feeds/${await opened.issueFeedToken(owner)}.ics`;
      io.out(values.json === true ? JSON.stringify({ url, owner }) : url);
      return 0;
    } catch (error) {
      if (!(error instanceof SlotwrightError) || error.code !== 'not_found') throw error;
      const message = `${error.message}; see 'slotwright check --workspace <dir>'`;
      if (values.json === true) io.out(JSON.stringify({ error: 'not_found', message }));
      else io.err(`slotwright subscription: ${message}`);
      return 1;
    } finally {
      await opened.close();
    }
  },
};
