/**
 * The Redis connection and the one queue of a Forelight cluster. `--cluster redis://[user:pass@]host:port[/db]`
 * names it; every coordinator and worker of one installation uses the same URL (and so the same queue).
 */
import { Redis } from 'ioredis';
import { ForelightError } from '../core/errors.ts';

export const EXTRACT_QUEUE = 'forelight-extract';

export interface RedisConnection {
  readonly host: string;
  readonly port: number;
  readonly db?: number;
  readonly username?: string;
  readonly password?: string;
  /** BullMQ workers block on Redis; ioredis must not give up on their commands. */
  readonly maxRetriesPerRequest: null;
}

export function parseClusterUrl(url: string): RedisConnection {
  let u: URL;
  try {
    u = new URL(url);
  } catch {
    throw new ForelightError(
      'cli',
      'cluster-url',
      `--cluster '${url}' is not a URL`,
      'write it as redis://HOST:PORT, e.g. redis://127.0.0.1:6379',
    );
  }
  if (u.protocol !== 'redis:')
    throw new ForelightError('cli', 'cluster-url', `--cluster '${url}' is not a redis:// URL`, 'write it as redis://HOST:PORT');
  const db = u.pathname.length > 1 ? Number(u.pathname.slice(1)) : undefined;
  return {
    host: u.hostname || '127.0.0.1',
    port: u.port ? Number(u.port) : 6379,
    ...(db !== undefined && Number.isInteger(db) ? { db } : {}),
    ...(u.username ? { username: decodeURIComponent(u.username) } : {}),
    ...(u.password ? { password: decodeURIComponent(u.password) } : {}),
    maxRetriesPerRequest: null,
  };
}

/** The URL as safe to print (no password). */
export const shownUrl = (url: string): string => url.replace(/\/\/([^:@/]*):[^@/]*@/, '//$1@');

/** A Redis client for one BullMQ queue, worker or event listener (BullMQ takes a built client under native ESM). */
export function redisClient(url: string): Redis {
  const { maxRetriesPerRequest, ...where } = parseClusterUrl(url);
  return new Redis({ ...where, maxRetriesPerRequest, lazyConnect: false });
}
