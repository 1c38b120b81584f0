/**
 * Reads what the app sent through the local SMTP catcher (scripts/mail-catcher.ts), the way a
 * person reads their inbox: by address, newest first.
 */
import { config } from '../config';

export type CaughtMail = {
	id: number;
	from: string;
	to: string[];
	subject: string;
	text: string;
	date: string;
};

export async function listMail(to: string): Promise<CaughtMail[]> {
	const res = await fetch(
		`${config.mailCatcherUrl}/messages?to=${encodeURIComponent(to.toLowerCase())}`
	);
	if (!res.ok) {
		throw new Error(
			`The mail catcher answered ${res.status}; is it running (scripts/lib.sh ensure_mail_catcher)?`
		);
	}
	return (await res.json()) as CaughtMail[];
}

/**
 * The newest mail to `to` (matching `subject` if given, and newer than mail `afterId`), waiting for
 * it to arrive. Addresses from the factories are unique, so a test sees only its own mail.
 */
export async function waitForMail(
	to: string,
	opts: { subject?: string | RegExp; afterId?: number; timeoutMs?: number } = {}
): Promise<CaughtMail> {
	const deadline = Date.now() + (opts.timeoutMs ?? 10_000);
	const matches = (m: CaughtMail) =>
		m.id > (opts.afterId ?? 0) &&
		(opts.subject === undefined ||
			(typeof opts.subject === 'string'
				? m.subject.includes(opts.subject)
				: opts.subject.test(m.subject)));
	for (;;) {
		const found = (await listMail(to)).find(matches);
		if (found) return found;
		if (Date.now() > deadline) {
			throw new Error(
				`No mail to ${to}${opts.subject ? ` with subject ${opts.subject}` : ''} arrived in time.`
			);
		}
		await new Promise((r) => setTimeout(r, 100));
	}
}

/** The id of the newest mail to `to` (0 if none), to wait for mail sent after this moment. */
export async function lastMailId(to: string): Promise<number> {
	const [newest] = await listMail(to);
	return newest?.id ?? 0;
}

/** The first absolute http(s) link in `text` whose path starts with `pathPrefix`. */
export function extractLink(text: string, pathPrefix: string): string {
	for (const [raw] of text.matchAll(/https?:\/\/[^\s<>"')]+/g)) {
		const url = new URL(raw);
		if (url.pathname.startsWith(pathPrefix)) return url.toString();
	}
	throw new Error(`No link to ${pathPrefix}… in:\n${text}`);
}
