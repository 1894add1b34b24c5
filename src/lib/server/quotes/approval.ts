/**
 * When a quote needs a sales manager's approval before it can be sent. Pure.
 *
 * The rule (product design §5): a discount above the rep's authority, or a margin below the company
 * floor, needs a manager. Both are compared in whole basis points as priced (see pricing.ts), and
 * both limits are inclusive: a discount exactly at the authority, or a margin exactly at the floor,
 * is within the rep's power; one basis point past either is not.
 */
import { formatBp } from '../../money';

/** The figures of a priced quote that the rule looks at (QuoteTotals from pricing.ts fits). */
export interface ApprovalFigures {
	/** largest discount on any charged line, bp */
	maxLineDiscountBp: number;
	/** whole-quote discount against list (line and overall discounts together), bp */
	effectiveDiscountBp: number;
	/** margin on the net before tax, bp; null when the net is zero and no margin can be stated */
	marginBp: number | null;
}

/** Company settings the rule applies. */
export interface ApprovalPolicy {
	/** the largest discount a rep may give on their own, bp (1 500 = 15 %) */
	repDiscountAuthorityBp: number;
	/** the lowest margin the company accepts without a manager, bp (1 200 = 12 %) */
	marginFloorBp: number;
}

export interface ApprovalDecision {
	required: boolean;
	/** one plain sentence per reason, in the order: line discount, whole-quote discount, margin */
	reasons: string[];
}

/**
 * Decide whether a manager must approve: a line discount or the whole-quote discount strictly above
 * `repDiscountAuthorityBp`, or a margin strictly below `marginFloorBp` (or no margin at all, when the
 * net is zero), needs approval. All figures are whole basis points.
 */
export function needsApproval(figures: ApprovalFigures, policy: ApprovalPolicy): ApprovalDecision {
	const reasons: string[] = [];
	const authority = policy.repDiscountAuthorityBp;
	if (figures.maxLineDiscountBp > authority) {
		reasons.push(
			`A line discount of ${formatBp(figures.maxLineDiscountBp)} is above the rep's discount authority of ${formatBp(authority)}.`
		);
	}
	if (figures.effectiveDiscountBp > authority) {
		reasons.push(
			`The discount off list for the whole quote, ${formatBp(figures.effectiveDiscountBp)}, is above the rep's discount authority of ${formatBp(authority)}.`
		);
	}
	if (figures.marginBp === null) {
		reasons.push(
			'The quote has no net price, so its margin cannot be checked against the company floor.'
		);
	} else if (figures.marginBp < policy.marginFloorBp) {
		reasons.push(
			`The margin of ${formatBp(figures.marginBp)} is below the company floor of ${formatBp(policy.marginFloorBp)}.`
		);
	}
	return { required: reasons.length > 0, reasons };
}
