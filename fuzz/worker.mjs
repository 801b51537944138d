/** A fuzz worker process: runs inputs [from, to) of one target, reporting each index as it starts and each outcome. */
import { runOne } from './targets.mjs';

process.on('message', async (job) => {
  const { target, seed, from, to } = job;
  for (let i = from; i < to; i++) {
    process.send({ at: i });
    const r = await runOne(target, seed, i);
    process.send(r.outcome === 'ok' || r.outcome === 'named' ? { r: i, o: r.outcome } : { r: i, o: r.outcome, m: r.message.slice(0, 300) });
  }
  process.send({ done: true });
});
process.send({ ready: true });
