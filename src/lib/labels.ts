/**
 * Plain names and lists shared by the engine, the schemas, the route matcher and the pages. No
 * imports: a route matcher is part of every page's first JavaScript.
 */

/** The wizard's steps in order. */
export const SURVEY_STEPS = ['site', 'fleet', 'operation', 'equipment', 'charging', 'notes', 'review'] as const;

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

