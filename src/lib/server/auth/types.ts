export type Role = 'rep' | 'manager' | 'admin';

/** What every server load and action knows about the signed-in user. */
export interface SessionUser {
	id: string;
	email: string;
	name: string;
	role: Role;
	teamId: string | null;
	unitSystem: 'metric' | 'imperial';
}
