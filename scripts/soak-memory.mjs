// Preloaded into the soak's server (NODE_OPTIONS=--import): prints the process's memory every
// 5 s on stderr so scripts/soak.ts can read it. The main thread only; workers have their own heap.
import { isMainThread } from 'node:worker_threads';

if (isMainThread) {
	const print = () => console.error(`soak-memory ${JSON.stringify(process.memoryUsage())}`);
	print();
	setInterval(print, 5000).unref();
}
