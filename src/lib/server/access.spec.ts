/**
 * roleMay over every action × role, written out from the roles as the product defines them:
 * owner — everything, members; designer — create and edit enclosures, parts, builds;
 * client — sees what is shared with them, comments, approves, pays the deposit.
 * Paying is the client's act alone: the one thing an owner does not do.
 */
import { describe, expect, it } from 'vitest';
import { permissions, roleMay, type Action } from './access';
import type { Role } from './db/schema';

const O = 'owner',
	D = 'designer',
	C = 'client';

/** Who may, per action. A new action must be added here, or the completeness test fails. */
const expected: Record<Action, Role[]> = {
	'studio.view': [O, D, C],
	'studio.members': [O],
	'catalog.view': [O, D],
	'catalog.edit': [O, D],
	'build.list': [O, D, C],
	'build.view': [O, D, C],
	'build.edit': [O, D],
	'build.share': [O, D],
	'build.comment': [O, D, C],
	'build.approve': [O, C],
	'build.quote': [O, D],
	'build.photos': [O, D],
	'build.pay': [C]
};

const roles: Role[] = [O, D, C];
const cells = (Object.keys(expected) as Action[]).flatMap((action) =>
	roles.map((role) => [action, role, expected[action].includes(role)] as const)
);

describe('roleMay', () => {
	it.each(cells)('%s as %s → %s', (action, role, allowed) => {
		expect(roleMay(role, action)).toBe(allowed);
	});

	it.each(Object.keys(expected) as Action[])(
		'%s without a role (not a member) → false',
		(action) => {
			expect(roleMay(null, action)).toBe(false);
			expect(roleMay(undefined, action)).toBe(false);
		}
	);

	it('knows exactly the actions this table lists', () => {
		expect(Object.keys(permissions).sort()).toEqual(Object.keys(expected).sort());
	});

	it('lets the owner do everything but pay', () => {
		for (const action of Object.keys(permissions) as Action[]) {
			expect(roleMay(O, action), action).toBe(action !== 'build.pay');
		}
	});

	it('refuses a role the database does not know', () => {
		expect(roleMay('admin' as Role, 'studio.view')).toBe(false);
	});
});
