import { randomUUID } from 'node:crypto';
import type { Issue } from '../errors.ts';
import {
  type NamedEntity,
  parseRule,
  type Rule,
  type RuleConfirmation,
  type RuleIssue,
  type RuleSubject,
  ruleConfirmation,
  ruleSchema,
} from '../rules/index.ts';
import type { RuleStore, StoredRule } from './ports.ts';

/** The person setting, listing or forgetting rules. */
export interface RuleActor {
  readonly id: string;
  /** IANA zone the person's dates are read in. */
  readonly zone: string;
  /** Admins may set rules for other people, rooms and groups. */
  readonly admin: boolean;
}

/** What the rule use cases need. */
export interface RuleDeps {
  readonly store: RuleStore;
  /** People a sentence may name. @default [] */
  readonly people?: readonly NamedEntity[];
  /** Rooms a sentence may name. @default [] */
  readonly rooms?: readonly NamedEntity[];
  /** Groups a sentence may name. @default [] */
  readonly groups?: readonly NamedEntity[];
  /** Makes ids for saved rules. @default crypto.randomUUID */
  readonly newId?: () => string;
}

/** A parsed rule waiting for a yes: the echo-back content plus the token that confirms it. */
export interface RulePreviewData extends RuleConfirmation {
  /** Whose rules it joins (see ruleOwnerId). */
  readonly ownerId: string;
  /** Opaque; pass it back to saveRule once the person says yes. */
  readonly token: string;
}

/** Outcome of a rule use case: a value, or issues (rule issues carry suggestions). */
export type RuleResult<T> =
  | { readonly ok: true; readonly value: T }
  | { readonly ok: false; readonly issues: readonly (Issue | RuleIssue)[] };

/** Whose rule list a rule joins: the speaker's own id, a person id, or `room:<id>` / `group:<id>`. */
export function ruleOwnerId(subject: RuleSubject, speakerId: string): string {
  switch (subject.kind) {
    case 'speaker':
      return speakerId;
    case 'person':
      return subject.id;
    case 'room':
      return `room:${subject.id}`;
    case 'group':
      return `group:${subject.id}`;
  }
}

function refuse(code: string, message: string, path: readonly (string | number)[] = []): RuleResult<never> {
  return { ok: false, issues: [{ code, path, message }] };
}

function mayBind(actor: RuleActor, ownerId: string): boolean {
  return actor.admin || ownerId === actor.id;
}

function encodeToken(ownerId: string, text: string, rule: Rule): string {
  return Buffer.from(JSON.stringify({ v: 1, ownerId, text, rule }), 'utf8').toString('base64url');
}

function decodeToken(token: string): { ownerId: string; text: string; rule: Rule } | undefined {
  try {
    const raw = JSON.parse(Buffer.from(token, 'base64url').toString('utf8')) as unknown;
    if (typeof raw !== 'object' || raw === null) return undefined;
    const r = raw as Record<string, unknown>;
    const rule = ruleSchema.safeParse(r.rule);
    if (r.v !== 1 || typeof r.ownerId !== 'string' || typeof r.text !== 'string' || !rule.success)
      return undefined;
    return { ownerId: r.ownerId, text: r.text, rule: rule.data };
  } catch {
    return undefined;
  }
}

/**
 * Parses and previews a rule said by `actor`: the normalized sentence, its structure and the
 * actor's existing rules it repeats, overlaps or contradicts. Nothing is saved.
 */
export async function previewRule(
  deps: RuleDeps,
  actor: RuleActor,
  text: string,
  now: number,
): Promise<RuleResult<RulePreviewData>> {
  const parsed = parseRule(text, {
    zone: actor.zone,
    now,
    speaker: actor.id,
    people: deps.people ?? [],
    rooms: deps.rooms ?? [],
    groups: deps.groups ?? [],
  });
  if (!parsed.ok) return parsed;
  const ownerId = ruleOwnerId(parsed.rule.subject, actor.id);
  if (!mayBind(actor, ownerId))
    return refuse('unauthorized', `Only an admin can set rules for ${ownerId}; say it as your own rule`, [
      'subject',
    ]);
  const existing = await deps.store.list(ownerId);
  const confirmation = ruleConfirmation(
    parsed,
    existing.map((r) => r.rule),
    { zone: actor.zone },
  );
  return {
    ok: true,
    value: { ...confirmation, ownerId, token: encodeToken(ownerId, parsed.text, parsed.rule) },
  };
}

/** Saves a previewed rule once the person confirmed it; the token is checked again, never trusted. */
export async function saveRule(
  deps: RuleDeps,
  actor: RuleActor,
  token: string,
  now: number,
): Promise<RuleResult<StoredRule>> {
  const decoded = decodeToken(token);
  if (decoded === undefined)
    return refuse('bad_argument', 'That confirmation is not one we gave out; type the rule again', ['token']);
  if (ruleOwnerId(decoded.rule.subject, actor.id) !== decoded.ownerId || !mayBind(actor, decoded.ownerId))
    return refuse('unauthorized', 'That confirmation belongs to someone else; type the rule again', [
      'token',
    ]);
  const saved: StoredRule = {
    id: (deps.newId ?? randomUUID)(),
    ownerId: decoded.ownerId,
    rule: decoded.rule,
    text: decoded.text,
    createdAt: now,
  };
  await deps.store.add(saved);
  return { ok: true, value: saved };
}

/** The rules of the actor, or of another owner id for admins, oldest first. */
export async function listRules(
  deps: RuleDeps,
  actor: RuleActor,
  ownerId: string = actor.id,
): Promise<RuleResult<readonly StoredRule[]>> {
  if (!mayBind(actor, ownerId))
    return refuse('unauthorized', `Only an admin can list the rules of ${ownerId}`);
  return { ok: true, value: await deps.store.list(ownerId) };
}

/** Forgets one rule; the rule must belong to the actor (or the actor is an admin naming its owner). */
export async function forgetRule(
  deps: RuleDeps,
  actor: RuleActor,
  ruleId: string,
  ownerId: string = actor.id,
): Promise<RuleResult<StoredRule>> {
  if (!mayBind(actor, ownerId)) return refuse('unauthorized', `Only an admin can forget rules of ${ownerId}`);
  const rule = (await deps.store.list(ownerId)).find((r) => r.id === ruleId);
  if (rule === undefined)
    return refuse(
      'not_found',
      `There is no rule '${ruleId}' among the rules of ${ownerId}; list them to see the ids`,
      ['ruleId'],
    );
  await deps.store.remove(ownerId, ruleId);
  return { ok: true, value: rule };
}
