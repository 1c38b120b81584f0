/**
 * CPU time of processes from Linux's /proc (utime + stime of every thread, clock ticks), for
 * `npm run bench:http`'s breakdown of where a request's CPU goes: the app processes, nginx,
 * PostgreSQL and the load generator, each as microseconds of CPU per request.
 */
import { execFileSync } from 'node:child_process';
import { readFileSync, readdirSync } from 'node:fs';

const TICKS_PER_S = (() => {
	try {
		return Number(execFileSync('getconf', ['CLK_TCK'], { encoding: 'utf8' }).trim()) || 100;
	} catch {
		return 100;
	}
})();

type Stat = { pid: number; ppid: number; comm: string; cpuS: number };

function stat(pid: number): Stat | null {
	try {
		const text = readFileSync(`/proc/${pid}/stat`, 'utf8');
		// The command name is in parentheses and may hold spaces; the fields after it are fixed.
		const close = text.lastIndexOf(')');
		const comm = text.slice(text.indexOf('(') + 1, close);
		const f = text
			.slice(close + 2)
			.split(' ')
			.map(Number);
		// f[0] is field 3 (state); utime is field 14, stime field 15, ppid field 4.
		return { pid, ppid: f[1], comm, cpuS: (f[11] + f[12]) / TICKS_PER_S };
	} catch {
		return null; // gone since the listing
	}
}

function all(): Stat[] {
	return readdirSync('/proc')
		.filter((d) => /^\d+$/.test(d))
		.map((d) => stat(Number(d)))
		.filter((s): s is Stat => s !== null);
}

/** `root` and every process below it. */
export function descendants(root: number, procs = all()): Stat[] {
	const byParent = new Map<number, Stat[]>();
	for (const p of procs) byParent.set(p.ppid, [...(byParent.get(p.ppid) ?? []), p]);
	const out: Stat[] = [];
	const walk = (pid: number) => {
		for (const c of byParent.get(pid) ?? []) {
			out.push(c);
			walk(c.pid);
		}
	};
	const self = procs.find((p) => p.pid === root);
	if (self) out.push(self);
	walk(root);
	return out;
}

/** Which processes make up each group, found again at every reading (backends come and go). */
export type Groups = Record<string, () => Stat[]>;

/** Seconds of CPU each group has used so far (a process that exited is no longer counted, so
 * groups should be made of long-lived processes: servers, pooled database backends). */
export function cpuNow(groups: Groups): Record<string, number> {
	return Object.fromEntries(
		Object.entries(groups).map(([name, find]) => [name, find().reduce((s, p) => s + p.cpuS, 0)])
	);
}

export function cpuSince(groups: Groups, before: Record<string, number>): Record<string, number> {
	const now = cpuNow(groups);
	return Object.fromEntries(Object.keys(groups).map((k) => [k, now[k] - (before[k] ?? 0)]));
}

/** The processes of the PostgreSQL server that runs backend `backendPid` (its postmaster's tree). */
export function postgresOf(backendPid: number): () => Stat[] {
	const backend = stat(backendPid);
	if (!backend) throw new Error(`no process ${backendPid} (is PostgreSQL on another machine?)`);
	return () => descendants(backend.ppid);
}

function cmdline(pid: number): string {
	try {
		return readFileSync(`/proc/${pid}/cmdline`, 'utf8').replaceAll('\0', ' ');
	} catch {
		return '';
	}
}

/** `pid` and the processes below it whose command line matches (or holds the given text). */
export function below(pid: number, command: RegExp | string): () => Stat[] {
	const matches = (line: string) =>
		typeof command === 'string' ? line.includes(command) : command.test(line);
	return () => descendants(pid).filter((p) => matches(cmdline(p.pid)));
}

/** This process alone. */
export function thisProcess(): Stat[] {
	const s = stat(process.pid);
	return s ? [s] : [];
}
