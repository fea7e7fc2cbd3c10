import { spawn } from 'node:child_process';
import { generateKeyPairSync, randomBytes } from 'node:crypto';
import net from 'node:net';

const freePort = () =>
  new Promise<number>((resolve, reject) => {
    const srv = net.createServer();
    srv.on('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const { port } = srv.address() as net.AddressInfo;
      srv.close(() => resolve(port));
    });
  });

/**
 * The server as `npm start` runs it, in its own process, serving the built client; no mail worker.
 * `nodeArgs` go to Node before the script (the write path's CPU profile passes --cpu-prof).
 */
export async function startApi(databaseUrl: string, clientDir: string, nodeArgs: string[] = []) {
  const port = await freePort();
  const child = spawn(process.execPath, [...nodeArgs, '--import', 'tsx', 'server/index.ts'], {
    env: {
      ...process.env,
      NODE_ENV: 'production',
      DATABASE_URL: databaseUrl,
      PORT: String(port),
      SEED_DEMO: 'never',
      MAIL_WORKER: 'off',
      CLIENT_DIR: clientDir,
      JWT_SECRET: randomBytes(32).toString('hex'),
      // the sequencer runs and signs heads, as on a plant's server
      AUDIT_SIGNING_KEY: generateKeyPairSync('ed25519').privateKey.export({ format: 'pem', type: 'pkcs8' }).toString(),
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  child.stdout.on('data', (d) => (out += d));
  child.stderr.on('data', (d) => (out += d));
  const exited = new Promise<number | null>((resolve) => child.on('exit', resolve));
  await new Promise<void>((resolve, reject) => {
    const timer = setInterval(() => out.includes('Coretrail is running at') && (clearInterval(timer), resolve()), 50);
    void exited.then(() => (clearInterval(timer), reject(new Error(`the API did not start:\n${out}`))));
  });
  const url = `http://127.0.0.1:${port}`;
  return {
    url,
    output: () => out,
    /** A session cookie for a demo user of this role. */
    async signIn(role: string) {
      const res = await fetch(`${url}/api/auth/login`, {
        method: 'POST',
        headers: { 'content-type': 'application/json' },
        body: JSON.stringify({ email: `${role}@larkspur.example`, password: `${role}-coretrail-demo` }),
      });
      const cookie = res.headers.get('set-cookie')?.split(';')[0];
      if (res.status !== 200 || !cookie) throw new Error(`sign-in as ${role}: ${res.status}`);
      return cookie;
    },
    async stop() {
      child.kill('SIGTERM');
      await exited;
    },
  };
}
