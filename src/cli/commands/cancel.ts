import { openStoreFromEnv } from '../../store/index.ts';
import { parseVerbArgs, stringOption } from '../args.ts';
import type { CliCommand } from '../main.ts';
import { actorOf, cliBookingService, loadWorkspaceOrThrow } from './book.ts';

const USAGE = `Usage: slotwright cancel <booking-id> --workspace <dir> [--as <person-id>] [--json]

Cancels a booking (or releases a hold). Only its organizer or a workspace admin may.

  --workspace  folder with workspace.yaml
  --as         person acting (default: the local operator)
  --json       print JSON

Store: SLOTWRIGHT_DATABASE_URL, else data/slotwright.sqlite under the current folder.
Exit codes: 0 cancelled (or already cancelled), 1 unknown booking, refused or unreadable input,
2 bad arguments.`;

/** `slotwright cancel`. */
export const command: CliCommand = {
  name: 'cancel',
  summary: 'cancel a booking or release a hold',
  usage: USAGE,
  async run(args, io) {
    const { values, positionals } = parseVerbArgs(
      args,
      { workspace: { type: 'string' }, as: { type: 'string' }, json: { type: 'boolean' } },
      { min: 1, max: 1, names: 'the booking id' },
    );
    const id = positionals[0]!;
    const ws = loadWorkspaceOrThrow(stringOption(values, 'workspace', true), io.now());
    const actor = actorOf(ws, stringOption(values, 'as'));
    const json = values.json === true;
    const handle = await openStoreFromEnv(io.env, process.cwd());
    try {
      const r = await cliBookingService(handle, ws, io).cancel(actor, id);
      if (!r.ok) {
        const issue = r.issues[0]!;
        if (json) io.out(JSON.stringify({ error: issue.code, message: issue.message }));
        else io.err(`slotwright cancel: ${issue.message}`);
        return 1;
      }
      const b = r.value.booking;
      if (json) io.out(JSON.stringify({ booking: { id: b.id, state: b.state, sequence: b.sequence } }));
      else io.out(`cancelled ${b.id}`);
      return 0;
    } finally {
      await handle.close();
    }
  },
};
