// Public surface of src/bot: named exports only, no `export *`.
export { type ConsoleOptions, runConsole } from './console.ts';
export { Conversation, isSlow, issuesReply, meetReply, workingReply } from './conversation.ts';
export { InMemoryDeliveryLog } from './in-memory-delivery-log.ts';
export { userMessage } from './messages.ts';
export {
  type ChatIntent,
  type DateWindow,
  type Handle,
  type MeetIntent,
  parseChatCommand,
} from './parse-command.ts';
export { type BlockKitMessage, renderBlockKit } from './render-block-kit.ts';
export { formatLocal, renderText, type TextRendering } from './render-text.ts';
export {
  ACTION,
  NEW_REQUEST_VIEW,
  type Reply,
  type ReplyAction,
  type ReplyBlock,
  type Span,
} from './reply.ts';
export { signSlackRequest, verifySlackRequest } from './signature.ts';
export {
  type RunningSlackApp,
  type SlackAppOptions,
  type SlackConnection,
  startSlackApp,
} from './slack-app.ts';
export { SlackChatTransport } from './slack-chat-transport.ts';
