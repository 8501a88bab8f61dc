import { resourceKeys } from '@/lib/query-keys';

export const logKeys = resourceKeys('logs');

/** A log is still being worked on: its list and its page keep asking. */
export const isRunning = (status: string) => status !== 'ready' && status !== 'failed';
