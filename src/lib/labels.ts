/** Names people read for the survey steps and the four setups (the ids are stored). */
export const STEP_LABELS: Record<string, string> = {
	site: 'Site and contact',
	fleet: 'Trucks and battery',
	operation: 'Operation',
	equipment: 'Existing equipment',
	charging: 'Charging area',
	notes: 'Photos and notes',
	review: 'Review'
};

export const SETUP_LABELS: Record<string, string> = {
	'in-truck': 'Service in truck',
	'roller-bed': 'Side transfer',
	'trolley-stand': 'Trolley exchange',
	'overhead-hoist': 'Hoist exchange'
};

/** What each engine check looks at, as a heading people read (the code stays in the data). */
export const CHECK_LABELS: Record<string, string> = {
	voltage: 'Battery voltage',
	'battery-weight': 'Battery weight (counterweight)',
	'compartment-fit': 'Fit in the compartment',
	'fork-length': 'Pallet-truck fork length',
	'fork-width': 'Pallet-truck fork width',
	'roller-height': 'Roller height',
	'door-swing': 'Compartment door',
	'handling-capacity': 'Lifting and carrying capacity',
	'floor-space': 'Floor space',
	ventilation: 'Charging-area air',
	duty: 'Energy for the shift'
};

/** A check's outcome in words. */
export const RESULT_LABELS: Record<string, string> = {
	pass: 'Fits',
	warn: 'Needs attention',
	fail: 'Does not fit'
};
