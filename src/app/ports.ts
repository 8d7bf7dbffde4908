// Ports: the calls the use cases make on outer adapters, and nothing more. Each section belongs to the
// part of the code that implements it; edit only your own section.

// --- store (bookings, holds, deliveries, audit) ---

// --- calendar feeds ---

// --- chat ---

/** Where a chat message went, so it can be updated in place later. */
export interface ChatMessageRef {
  readonly channel: string;
  readonly ts: string;
}

/** A chat user's profile as the platform reports it. */
export interface ChatUserProfile {
  readonly chatId: string;
  readonly email?: string;
  /** IANA zone from the profile, when the platform gives one. */
  readonly zone?: string;
  readonly displayName?: string;
}

/**
 * The calls use cases and jobs make on a chat platform. `message` is the surface's own rendering of a
 * reply (Block Kit for Slack, text for the console); the transport does not look inside it.
 */
export interface ChatTransport {
  /** Posts a message to a channel or a user's direct-message channel. */
  post(
    channel: string,
    message: { readonly text: string; readonly blocks?: readonly unknown[] },
  ): Promise<ChatMessageRef>;
  /** Replaces a posted message. */
  update(
    ref: ChatMessageRef,
    message: { readonly text: string; readonly blocks?: readonly unknown[] },
  ): Promise<void>;
  /** Looks a user up; undefined when the platform does not know them. */
  userProfile(chatId: string): Promise<ChatUserProfile | undefined>;
}

/**
 * Remembers which chat deliveries (event ids, button clicks) were already processed, so a retried
 * delivery or a repeated click runs once. Must be shared by all replicas to hold across them.
 */
export interface DeliveryLog {
  /** True the first time a key is seen, false on every later call with the same key. */
  claim(key: string, atMs: number): Promise<boolean>;
}
