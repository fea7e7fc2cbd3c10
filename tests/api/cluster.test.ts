import fs from 'node:fs';
import net from 'node:net';
import { describe, expect, it } from 'vitest';
import { ClusterError, freePort, startCluster, throwawayClusterDir } from '../../db/cluster.mjs';

describe('the local PostgreSQL lifecycle', () => {
  it('when the port is taken by another program, then a clear message and no hang', async () => {
    const port = await freePort();
    const squatter = net.createServer().listen(port, '127.0.0.1');
    await new Promise((r) => squatter.once('listening', r));
    const dir = throwawayClusterDir();
    try {
      const err = await startCluster({ dir, port }).then(
        () => null,
        (e: unknown) => e,
      );
      expect(err).toBeInstanceOf(ClusterError);
      expect((err as Error).message).toMatch(new RegExp(`Port ${port} on 127.0.0.1 is already taken`));
      expect((err as Error).message).toMatch(/CORETRAIL_PG_PORT/);
    } finally {
      squatter.close();
      fs.rmSync(dir, { recursive: true, force: true });
    }
  }, 60_000);

  it('when started twice on the same folder, the second start reuses the running cluster; stop leaves none', async () => {
    const dir = throwawayClusterDir();
    const port = await freePort();
    try {
      const first = await startCluster({ dir, port });
      expect(first.startedHere).toBe(true);
      const second = await startCluster({ dir, port });
      expect(second.startedHere).toBe(false);
      const other = await freePort();
      await expect(startCluster({ dir, port: other })).rejects.toThrow(/already running on port/);
      first.stop();
      expect(fs.existsSync(`${dir}/pgdata/postmaster.pid`)).toBe(false);
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  }, 90_000);
});
