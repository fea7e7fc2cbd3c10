import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { freePort, throwawayClusterDir } from '../../db/cluster.mjs';
import { apiPidUnder, startProject, waitFor } from '../support/process.js';
import { startServer } from '../support/process.js';

describe('the server process', () => {
  it('when its port is taken, then it says so plainly and exits 1', async () => {
    const port = await freePort();
    const squatter = net.createServer().listen(port, '127.0.0.1');
    await new Promise((r) => squatter.once('listening', r));
    try {
      const s = startServer(port);
      expect(await s.exited).toBe(1);
      expect(s.output()).toMatch(new RegExp(`Port ${port} on 127.0.0.1 is already in use. Set PORT to a free port.`));
    } finally {
      squatter.close();
    }
  }, 60_000);

  it('on SIGTERM it stops listening, closes its pool and exits 0', async () => {
    const port = await freePort();
    const s = startServer(port);
    await s.ready;
    const base = `http://127.0.0.1:${port}`;
    expect((await fetch(`${base}/api/health`)).status).toBe(200);
    s.child.kill('SIGTERM');
    expect(await s.exited).toBe(0);
    expect(s.output()).toMatch(/SIGTERM: finishing requests in flight, refusing new ones/);
    expect(s.output()).toMatch(/\[api\] stopped/);
    await expect(fetch(`${base}/api/health`)).rejects.toThrow();
  }, 60_000);
});

describe('npm start', () => {
  it('when the API process dies, then it is started again after a pause, the cluster keeps running, and the log says why; Ctrl-C then stops both', async () => {
    const dir = throwawayClusterDir();
    const port = await freePort();
    const p = startProject({ clusterDir: dir, port, pgPort: await freePort(), smtpPort: await freePort() });
    try {
      await waitFor(() => p.output().includes('Coretrail is running at'), 90_000, p.output);
      const first = apiPidUnder(p.child.pid!);
      process.kill(first, 'SIGKILL');
      // the supervisor says what happened and restarts it; PostgreSQL is never stopped
      await waitFor(
        () => /API process \d+ ended by SIGKILL .*; starting it again in \d+ s/.test(p.output()),
        10_000,
        p.output,
      );
      expect(p.child.exitCode).toBeNull();
      expect(fs.existsSync(path.join(dir, 'pgdata', 'postmaster.pid'))).toBe(true);
      expect(p.output()).not.toMatch(/PostgreSQL stopped/);
      await waitFor(() => p.output().split('Coretrail is running at').length === 3, 60_000, p.output);
      expect(apiPidUnder(p.child.pid!)).not.toBe(first);
      expect((await fetch(`http://127.0.0.1:${port}/api/health`)).status).toBe(200);

      // Ctrl-C in a terminal signals the whole foreground process group
      process.kill(-p.child.pid!, 'SIGINT');
      expect(await p.exited).toBe(0);
      expect(p.output()).toMatch(/PostgreSQL stopped/);
      expect(fs.existsSync(path.join(dir, 'pgdata', 'postmaster.pid'))).toBe(false);
      await expect(fetch(`http://127.0.0.1:${port}/api/health`)).rejects.toThrow();
    } finally {
      if (p.child.exitCode === null) process.kill(-p.child.pid!, 'SIGKILL');
      fs.rmSync(dir, { recursive: true, force: true });
    }
  }, 180_000);
});
