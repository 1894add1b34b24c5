import type { SessionUser } from '$lib/server/auth/types';

declare global {
	namespace App {
		interface Error {
			message: string;
			errorId?: string;
			/** why a customer link cannot show its quote */
			kind?: 'superseded' | 'expired' | 'invalid';
		}
		interface Locals {
			user: SessionUser | null;
			session: { id: string; expiresAt: Date; fresh: boolean } | null;
		}
		// interface PageData {}
		// interface PageState {}
		// interface Platform {}
	}
}

export {};
