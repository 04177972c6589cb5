/** Alert notifications (design §4b): channels (webhook, e-mail), the outbox, the dispatcher, escalation. */
export { Notifier, type NotifierOptions, type LinkAcknowledgement } from './notifier.ts';
export { notifyFilterSchema, filterPasses, type NotifyFilter } from './filter.ts';
export { escalationChainsSchema, type EscalationStep } from './escalation.ts';
export { webhookSignature, webhookBodyText, type WebhookBody } from './webhookBody.ts';
export { retryDelayMs, defaultRetryDelaysMs, defaultMaxAttempts } from './retrySchedule.ts';
export type { Channel, AttemptResult } from './channels/channel.ts';
