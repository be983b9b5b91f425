export { DEFAULT_RETRY, retryDelayMs, type RetryPolicy } from './backoff';
export { escapeHtml, oneLine } from './html';
export {
	enqueueMail,
	listOutbox,
	retryMailNow,
	sendDueMail,
	sendQueuedMail,
	startMailRetryLoop,
	type OutboxMessage,
	type OutboxRow,
	type SendOptions
} from './outbox';
export { buildProposalEmail, type BuiltEmail, type ProposalEmailInput } from './proposal-email';
export { readFakeInbox, type FakeMail } from './fake-inbox';
export { createMailTransport, getMailTransport, type MailTransport } from './transport';
