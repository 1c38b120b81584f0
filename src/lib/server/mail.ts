import nodemailer from 'nodemailer';
import { config } from './config';

export type Mail = { to: string; subject: string; text: string; replyTo?: string };

let transport: ReturnType<typeof nodemailer.createTransport> | undefined;

function getTransport() {
	transport ??= nodemailer.createTransport({
		host: config.smtp.host,
		port: config.smtp.port,
		secure: false,
		// The local catcher speaks plain SMTP; real servers get STARTTLS when they offer it.
		ignoreTLS: config.smtp.host === '127.0.0.1' || config.smtp.host === 'localhost',
		auth: config.smtp.user ? { user: config.smtp.user, pass: config.smtp.pass } : undefined
	});
	return transport;
}

/** Sends one plain-text mail. Links are absolute, built from the configured origin. */
export async function sendMail(mail: Mail) {
	if (config.mailDisabled) {
		console.log(`mail: off (MAIL_DISABLED=1), not sent: "${mail.subject}" → ${mail.to}`);
		return 'mail-disabled';
	}
	const info = await getTransport().sendMail({ from: config.smtp.from, ...mail });
	if (!config.production) console.log(`mail: "${mail.subject}" → ${mail.to}`);
	return info.messageId as string;
}

export function link(path: string) {
	return new URL(path, config.origin).toString();
}

/**
 * Runs `send` (one or more mails) where a mail failure must not undo what was done: the failure is
 * logged as `mail: <failure>` and reported as false, never thrown.
 */
export async function sendOrLog(failure: string, send: () => Promise<unknown>): Promise<boolean> {
	try {
		await send();
		return true;
	} catch (e) {
		console.error(`mail: ${failure}`, e);
		return false;
	}
}
