// A read worker that dies on its first message (exit code 3), for the pool's crash handling in read-threads.test.ts.
import { parentPort } from 'node:worker_threads';

parentPort.on('message', () => process.exit(3));
