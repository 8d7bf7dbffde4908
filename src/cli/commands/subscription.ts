import { newSubscriptionToken } from '../../calendar/index.ts';
import { openStoreFromEnv, SqlLedgerStore } from '../../store/index.ts';
import { parseVerbArgs, stringOption } from '../args.ts';
import { UsageError } from '../io.ts';
import type { CliCommand } from '../main.ts';
import { loadWorkspaceOrThrow } from './book.ts';

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
    const ws = loadWorkspaceOrThrow(stringOption(values, 'workspace', true), io.now());
    const owner =
      person === undefined ? { kind: 'room' as const, id: room! } : { kind: 'person' as const, id: person };
    const known =
      owner.kind === 'person'
        ? ws.people.some((p) => p.id === owner.id)
        : ws.rooms.some((r) => r.id === owner.id);
    if (!known) {
      const message = `the workspace has no ${owner.kind} '${owner.id}'; see 'slotwright check --workspace <dir>'`;
      if (values.json === true) io.out(JSON.stringify({ error: 'not_found', message }));
      else io.err(`slotwright subscription: ${message}`);
      return 1;
    }
    const handle = await openStoreFromEnv(io.env, process.cwd());
    try {
      const token = newSubscriptionToken();
      await new SqlLedgerStore(handle).saveSubscriptionToken(token, owner, io.now());
      const url = `${base}/feeds/${token}.ics`;
      io.out(values.json === true ? JSON.stringify({ url, owner }) : url);
      return 0;
    } finally {
      await handle.close();
    }
  },
};
