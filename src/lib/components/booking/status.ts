// A booking's status in plain words, shared by the booking page and the lists.
import type { BookingStatus } from '$lib/domain/lifecycle';

export const STATUS_LABELS: Record<BookingStatus, string> = {
	held: 'Held',
	pending: 'Payment on its way',
	confirmed: 'Confirmed',
	completed: 'Completed',
	no_show: 'Nobody came',
	cancelled: 'Cancelled',
	expired: 'Expired'
};

/** Tailwind classes for a status tag, in the palette's roles. */
export const STATUS_TONES: Record<BookingStatus, string> = {
	held: 'bg-brass-light text-ink',
	pending: 'bg-brass-light text-ink',
	confirmed: 'bg-pine-light text-pine-dark',
	completed: 'bg-paper-sunk text-ink-soft',
	no_show: 'bg-warn-light text-warn',
	cancelled: 'bg-warn-light text-warn',
	expired: 'bg-paper-sunk text-ink-faint'
};

export function statusLabel(status: string): string {
	return STATUS_LABELS[status as BookingStatus] ?? status;
}

export function statusTone(status: string): string {
	return STATUS_TONES[status as BookingStatus] ?? 'bg-paper-sunk text-ink-soft';
}
