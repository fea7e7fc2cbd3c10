import net from 'node:net';
import { describe, expect, it } from 'vitest';
import { freePort } from '../../db/cluster.mjs';
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
