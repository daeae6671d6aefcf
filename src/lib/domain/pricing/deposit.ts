/**
 * Deposit and balance (our rule; taking a deposit of 25–100 % is common practice in studios).
 *
 * deposit = depositBp of the total, rounded UP to whole currency units (ISO 4217 minor units:
 * whole euros for EUR, whole yen for JPY), then at least depositMinimum, and never more than the
 * total (a small booking pays its whole total up front). balance = total − deposit.
 */
import { minorPerMajor, mulDivCeil } from '../money';
import type { Minor, StudioPolicy } from '../types';

export function depositFor(total: Minor, policy: Pick<StudioPolicy, 'currency' | 'depositBp' | 'depositMinimum'>): Minor {
	if (total <= 0) return 0;
	const unit = minorPerMajor(policy.currency);
	const share = mulDivCeil(total, policy.depositBp, 10_000 * unit) * unit;
	return Math.min(total, Math.max(share, policy.depositMinimum));
}

export function depositAndBalance(
	total: Minor,
	policy: Pick<StudioPolicy, 'currency' | 'depositBp' | 'depositMinimum'>
): { deposit: Minor; balance: Minor } {
	const deposit = depositFor(total, policy);
	return { deposit, balance: total - deposit };
}
