import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import pg from 'pg';
import { describe, expect, it } from 'vitest';
import {
  ClusterError,
  freePort,
  startCluster,
  throwawayClusterDir,
  walArchiveOf,
  type Cluster,
} from '../../db/cluster.mjs';

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

  it('when a plant turns archiving on once, then later starts keep it until it is turned off', async () => {
    const dir = throwawayClusterDir();
    const archive = path.join(dir, 'wal-archive');
    const port = await freePort();
    const archiveMode = async (c: Cluster) => {
      const client = new pg.Client({ connectionString: c.url('postgres') });
      await client.connect();
      try {
        return (await client.query<{ m: string }>("SELECT current_setting('archive_mode') AS m")).rows[0]!.m;
      } finally {
        await client.end();
      }
    };
    try {
      let c = await startCluster({ dir, port });
      expect(await archiveMode(c)).toBe('off');
      c.stop();
      c = await startCluster({ dir, port, walArchive: archive });
      expect(await archiveMode(c)).toBe('on');
      // only the server's user may enter the archive
      expect((fs.statSync(archive).mode & 0o777).toString(8)).toBe('700');
      c.stop();
      // a script that does not say (db:migrate, run-with-db) keeps the plant's setting
      c = await startCluster({ dir, port });
      expect(await archiveMode(c)).toBe('on');
      expect(walArchiveOf(c.pgdata)).toBe(archive);
      c.stop();
      c = await startCluster({ dir, port, walArchive: 'off' });
      expect(await archiveMode(c)).toBe('off');
      expect(walArchiveOf(c.pgdata)).toBeNull();
      c.stop();
      await expect(startCluster({ dir, port, walArchive: `${dir}/it's` })).rejects.toThrow(/without quotes/);
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  }, 90_000);
});
