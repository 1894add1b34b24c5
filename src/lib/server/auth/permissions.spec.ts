import { describe, expect, it } from 'vitest';
import { PERMISSIONS, ROLES, can, canSeeRecord, recordScope, startPage, type Permission } from './permissions';

// The expected matrix, written out by hand from the product design (§1: who does what).
const expected: Record<Permission, Record<'rep' | 'manager' | 'admin', boolean>> = {
	'evaluate:run': { rep: true, manager: true, admin: true },
	'catalogue:read': { rep: true, manager: true, admin: true },
	'customer:manage': { rep: true, manager: true, admin: true },
	'survey:edit': { rep: true, manager: true, admin: false },
	'survey:read': { rep: true, manager: true, admin: true },
	'upload:read': { rep: true, manager: true, admin: true },
	'quote:edit': { rep: true, manager: true, admin: false },
	'quote:read': { rep: true, manager: true, admin: true },
	'quote:submit': { rep: true, manager: true, admin: false },
	'quote:send': { rep: true, manager: true, admin: false },
	'quote:approve': { rep: false, manager: true, admin: false },
	'quote:see-cost': { rep: true, manager: true, admin: true },
	'pipeline:read': { rep: false, manager: true, admin: true },
	'admin:users': { rep: false, manager: false, admin: true },
	'admin:catalogue': { rep: false, manager: false, admin: true },
	'admin:price-book': { rep: false, manager: false, admin: true },
	'admin:settings': { rep: false, manager: false, admin: true },
	'admin:mail': { rep: false, manager: false, admin: true }
};

describe('permission matrix', () => {
	it('covers every permission the module defines', () => {
		expect(Object.keys(PERMISSIONS).sort()).toEqual(Object.keys(expected).sort());
	});

	for (const role of ROLES) {
		describe(role, () => {
			for (const [permission, row] of Object.entries(expected)) {
				it(`${row[role] ? 'may' : 'may not'} ${permission}`, () => {
					expect(can(role, permission as Permission)).toBe(row[role]);
				});
			}
		});
	}

	it('a rep never approves their own discount', () => {
		expect(can('rep', 'quote:approve')).toBe(false);
	});
});

describe('record scope', () => {
	const rep = { id: 'r1', role: 'rep' as const, teamId: 't1' };
	it('a rep sees their own and their team’s records only', () => {
		expect(recordScope('rep')).toBe('team');
		expect(canSeeRecord(rep, { id: 'r1', teamId: null })).toBe(true);
		expect(canSeeRecord(rep, { id: 'r2', teamId: 't1' })).toBe(true);
		expect(canSeeRecord(rep, { id: 'r3', teamId: 't2' })).toBe(false);
		expect(canSeeRecord({ ...rep, teamId: null }, { id: 'r3', teamId: null })).toBe(false);
	});
	it('managers and admins see everyone’s', () => {
		expect(canSeeRecord({ id: 'm', role: 'manager', teamId: null }, { id: 'x', teamId: 't9' })).toBe(true);
		expect(canSeeRecord({ id: 'a', role: 'admin', teamId: null }, { id: 'x', teamId: 't9' })).toBe(true);
	});
});

describe('start pages', () => {
	it('sends each role to its own start page', () => {
		expect(startPage('rep')).toBe('/surveys');
		expect(startPage('manager')).toBe('/pipeline');
		expect(startPage('admin')).toBe('/admin/users');
	});
});
