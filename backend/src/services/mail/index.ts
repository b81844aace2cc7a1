// Outgoing mail: enqueue (outbox.ts), send (dispatcher.ts), templates, and the development mailbox.
export { createMailService, type MailService, type EnqueueOptions } from './outbox';
export {
  createSmtpTransport,
  startOutboxDispatcher,
  type MailTransport,
  type OutboxDispatcher,
  type DispatchResult,
} from './dispatcher';
export { afterFailure, defaultBackoff, type BackoffPolicy } from './backoff';
export { renderMail, safetyCaution, productName, type MailContent, type RenderedMail } from './templates';
export { createMailboxService, type MailboxService, type StoredMail } from './mailbox';
