/** Alert notifications (design §4b): channels (webhook, e-mail, Web Push), the outbox, the dispatcher, escalation. */
export { Notifier, type NotifierOptions, type LinkAcknowledgement } from './notifier.ts';
export { notifyFilterSchema, filterPasses, type NotifyFilter } from './filter.ts';
export { escalationChainsSchema, type EscalationStep } from './escalation.ts';
export { webhookSignature, webhookBodyText, type WebhookBody } from './webhookBody.ts';
export { retryDelayMs, defaultRetryDelaysMs, defaultMaxAttempts } from './retrySchedule.ts';
export type { Channel, AttemptResult } from './channels/channel.ts';
export { PushNotifier, pushEvents, type PushActionAnswer } from './pushNotifier.ts';
export { pushSubscribeSchema, pushLabelSchema, shownSubscription } from './pushSubscriptions.ts';
export { pushActionPath, type PushMessage } from './pushMessage.ts';
