/** What `forelight status --cluster URL` shows: the workers connected, the queue's job counts and the latest failures. */
import { Queue } from 'bullmq';
import { EXTRACT_QUEUE, redisClient, shownUrl } from './connection.ts';
import type { ClusterAnswer, ClusterJob } from './coordinator.ts';

export interface ClusterStatus {
  readonly url: string;
  readonly workers: readonly string[];
  readonly counts: Readonly<Record<'waiting' | 'active' | 'delayed' | 'completed' | 'failed', number>>;
  readonly failed: readonly { readonly id: string; readonly path: string; readonly reason: string; readonly at: string }[];
}

export async function clusterStatus(url: string): Promise<ClusterStatus> {
  const client = redisClient(url);
  const queue = new Queue<ClusterJob, ClusterAnswer>(EXTRACT_QUEUE, { connection: client });
  try {
    const [workers, counts, failed] = await Promise.all([
      queue.getWorkers(),
      queue.getJobCounts('waiting', 'active', 'delayed', 'completed', 'failed'),
      queue.getFailed(0, 9),
    ]);
    return {
      url: shownUrl(url),
      workers: workers.map((w) => `${w.name ?? 'worker'} (${w.addr ?? '?'}, connected ${w.age ?? '?'} s)`),
      counts: counts as ClusterStatus['counts'], // BullMQ counts exactly the job types asked for (typed as any string)
      failed: failed.map((j) => ({
        id: j.id ?? '?',
        path:
          'path' in j.data ? j.data.path : 'start' in j.data ? j.data.start.path : `${j.data.source.id} ${j.data.config.regions[0]?.id}`,
        reason: j.failedReason,
        at: new Date(j.finishedOn ?? j.timestamp).toISOString(),
      })),
    };
  } finally {
    await queue.close();
    client.disconnect();
  }
}

export function formatClusterStatus(s: ClusterStatus): string[] {
  const c = s.counts;
  return [
    `cluster ${s.url}: ${s.workers.length} worker(s); jobs waiting ${c.waiting}, active ${c.active}, delayed ${c.delayed}, done ${c.completed}, failed ${c.failed}`,
    ...s.workers.map((w) => `  worker ${w}`),
    ...s.failed.map((f) => `  failed ${f.at} ${f.path}: ${f.reason}`),
  ];
}
