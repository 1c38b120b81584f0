/**
 * A local SMTP catcher for development and tests: accepts every message on 127.0.0.1 and keeps it
 * in memory, readable as JSON over HTTP (/messages) and as a page for the developer (/). Never used
 * in production (real SMTP comes from the env). The app itself has no page that shows other
 * people's mail: reading this log is for whoever runs the machine.
 */
import { createServer } from 'node:http';
import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';

const smtpPort = Number(process.env.SMTP_PORT ?? 2525);
const httpPort = Number(process.env.MAIL_CATCHER_HTTP_PORT ?? 2526);
const maxKept = 500;

type Caught = {
	id: number;
	from: string;
	to: string[];
	subject: string;
	text: string;
	date: string;
};
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
	if (url.pathname === '/' && req.method === 'GET') {
		res.setHeader('content-type', 'text/html; charset=utf-8');
		res.setHeader('content-security-policy', "default-src 'none'; style-src 'unsafe-inline'");
		res.end(logPage());
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

const esc = (s: string) =>
	s.replace(
		/[&<>"']/g,
		(c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!
	);

/** The newest 100 messages, plain text as sent. */
function logPage(): string {
	const items = [...messages]
		.reverse()
		.slice(0, 100)
		.map(
			(m) =>
				`<article><h2>${esc(m.subject)}</h2><p class="meta">${esc(m.date)} · to ${esc(m.to.join(', '))}</p><pre>${esc(m.text)}</pre></article>`
		)
		.join('');
	return `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Local mail catcher</title>
<style>body{font-family:system-ui,sans-serif;max-width:50rem;margin:2rem auto;padding:0 1rem}article{border-top:1px solid #ccc;padding:.5rem 0}h2{font-size:1rem;margin:.3rem 0}.meta{color:#555;font-size:.85rem;margin:0}pre{white-space:pre-wrap}</style>
</head><body><h1>Local mail catcher</h1><p>${messages.length} message(s) held in memory, newest first. Nothing here leaves this machine.</p>${items || '<p>No mail yet.</p>'}</body></html>`;
}

smtp.listen(smtpPort, '127.0.0.1', () => {
	http.listen(httpPort, '127.0.0.1', () => {
		console.log(
			`mail catcher: SMTP 127.0.0.1:${smtpPort}, read at http://127.0.0.1:${httpPort}/ (JSON: /messages)`
		);
	});
});
