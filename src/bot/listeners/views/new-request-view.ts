import type { MeetQuery } from '../../../app/service.ts';
import { NEW_REQUEST_VIEW } from '../../reply.ts';

/** Block ids of the request modal's inputs (each input's action id is `value`). */
export const FIELD = {
  required: 'required',
  optional: 'optional',
  length: 'length',
  from: 'from',
  to: 'to',
  seats: 'seats',
  features: 'features',
} as const;

const LENGTHS = [15, 30, 45, 60, 90, 120] as const;

/** The modal for a new meeting request. */
export function newRequestView(): Record<string, unknown> {
  const input = (block_id: string, label: string, element: Record<string, unknown>, optional = false) => ({
    type: 'input',
    block_id,
    optional,
    label: { type: 'plain_text', text: label },
    element: { action_id: 'value', ...element },
  });
  return {
    type: 'modal',
    callback_id: NEW_REQUEST_VIEW,
    title: { type: 'plain_text', text: 'New request' },
    submit: { type: 'plain_text', text: 'Find times' },
    close: { type: 'plain_text', text: 'Cancel' },
    blocks: [
      input(FIELD.required, 'Who must attend', { type: 'multi_users_select' }),
      input(FIELD.optional, 'Who may attend', { type: 'multi_users_select' }, true),
      input(FIELD.length, 'Length', {
        type: 'static_select',
        initial_option: option(30),
        options: LENGTHS.map(option),
      }),
      input(FIELD.from, 'From', { type: 'datepicker' }, true),
      input(FIELD.to, 'To', { type: 'datepicker' }, true),
      input(
        FIELD.seats,
        'Room for',
        { type: 'number_input', is_decimal_allowed: false, min_value: '1' },
        true,
      ),
      input(
        FIELD.features,
        'Room needs (comma-separated, e.g. screen, phone)',
        { type: 'plain_text_input' },
        true,
      ),
    ],
  };
}

function option(minutes: number): Record<string, unknown> {
  return { text: { type: 'plain_text', text: `${minutes} min` }, value: String(minutes) };
}

/** One input's state as the platform sends it on submission. */
interface FieldState {
  readonly selected_users?: readonly string[];
  readonly selected_option?: { readonly value: string } | null;
  readonly selected_date?: string | null;
  readonly value?: string | null;
}

/** Reads a submitted request modal; field errors are keyed by block id, as the platform shows them. */
export function readNewRequest(
  values: Readonly<Record<string, Readonly<Record<string, FieldState>>>>,
): { ok: true; query: MeetQuery } | { ok: false; errors: Record<string, string> } {
  const get = (block: string): FieldState => values[block]?.value ?? {};
  const errors: Record<string, string> = {};
  const required = get(FIELD.required).selected_users ?? [];
  if (required.length === 0) errors[FIELD.required] = 'Choose at least one person.';
  const length = Number(get(FIELD.length).selected_option?.value ?? 'NaN');
  if (!Number.isInteger(length) || length < 5) errors[FIELD.length] = 'Choose a length.';
  const from = get(FIELD.from).selected_date ?? undefined;
  const to = get(FIELD.to).selected_date ?? undefined;
  if (from !== undefined && to !== undefined && to < from)
    errors[FIELD.to] = 'The end date is before the start date.';
  const seatsText = get(FIELD.seats).value ?? undefined;
  const seats = seatsText === undefined || seatsText === '' ? undefined : Number(seatsText);
  if (seats !== undefined && (!Number.isInteger(seats) || seats < 1))
    errors[FIELD.seats] = 'Give a whole number of seats.';
  const featuresText = get(FIELD.features).value ?? '';
  const features = featuresText
    .split(',')
    .map((s) => s.trim().toLowerCase())
    .filter((s) => s !== '');
  if (Object.keys(errors).length > 0) return { ok: false, errors };
  const window = from === undefined && to === undefined ? undefined : { from: from ?? to!, to: to ?? from! };
  return {
    ok: true,
    query: {
      lengthMinutes: length,
      required: required.map((id) => ({ kind: 'chat', id })),
      optional: (get(FIELD.optional).selected_users ?? []).map((id) => ({ kind: 'chat', id })),
      features,
      ...(window === undefined ? {} : { window }),
      ...(seats === undefined ? {} : { roomFor: seats }),
    },
  };
}
