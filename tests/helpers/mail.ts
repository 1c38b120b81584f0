/** The mail catcher, for browser tests: the same helpers the Vitest suites use. */
export {
	extractLink,
	lastMailId,
	listMail,
	waitForMail,
	type CaughtMail
} from '../../src/lib/server/testing/mail';
