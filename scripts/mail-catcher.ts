/**
 * A local SMTP catcher for development and tests: accepts every message on 127.0.0.1 and keeps it
 * in memory, readable as JSON over HTTP. Never used in production (real SMTP comes from the env).
 */
import { createServer } from 'node:http';
import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';

const smtpPort = Number(process.env.SMTP_PORT ?? 2525);
const httpPort = Number(process.env.MAIL_CATCHER_HTTP_PORT ?? 2526);
const maxKept = 500;

type Caught = { id: number; from: string; to: string[]; subject: string; text: string; date: string };
const messages: Caught[] = [];
let nextId = 1;

const smtp = new SMTPServer({
	authOptional: true,
	disabledCommands: ['STARTTLS'],
	logger: false,
	size: 5 * 1024 * 1024,
	onData(stream, session, callback) {
		simpleParser(stream)
			.then((parsed) => {
				messages.push({
					id: nextId++,
					from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
					to: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
					subject: parsed.subject ?? '',
					text: parsed.text ?? '',
					date: new Date().toISOString()
				});
				if (messages.length > maxKept) messages.splice(0, messages.length - maxKept);
				callback();
			})
			.catch((err: Error) => callback(err));
	}
});

const http = createServer((req, res) => {
	const url = new URL(req.url ?? '/', `http://127.0.0.1:${httpPort}`);
	if (url.pathname === '/health') {
		res.end('ok');
		return;
	}
	if (url.pathname !== '/messages') {
		res.statusCode = 404;
		res.end();
		return;
	}
	if (req.method === 'DELETE') {
		messages.length = 0;
		res.end('[]');
		return;
	}
	const to = url.searchParams.get('to')?.toLowerCase();
	const list = to ? messages.filter((m) => m.to.includes(to)) : messages;
	res.setHeader('content-type', 'application/json');
	res.end(JSON.stringify([...list].reverse()));
});

smtp.listen(smtpPort, '127.0.0.1', () => {
	http.listen(httpPort, '127.0.0.1', () => {
		console.log(`mail catcher: SMTP 127.0.0.1:${smtpPort}, read at http://127.0.0.1:${httpPort}/messages`);
	});
});
