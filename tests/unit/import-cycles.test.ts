import madge from 'madge';
import { describe, expect, it } from 'vitest';

/**
 * No module imports itself through others: a cycle makes the order of loading decide what a
 * module sees, and it ties two areas of the code together. Type-only imports are left out, as they
 * are gone at run time. The check reads every TypeScript file of the server, the client, the
 * shared code and the migrations and seeders (madge, from the registry).
 */
describe('imports', () => {
  it('when every module’s imports are followed, then none leads back to itself', async () => {
    const graph = await madge(['server', 'shared', 'src', 'db'], {
      fileExtensions: ['ts', 'tsx'],
      tsConfig: 'tsconfig.json',
      detectiveOptions: { ts: { skipTypeImports: true }, tsx: { skipTypeImports: true } },
    });
    // the graph really was read: a few hundred files, the server's entry among them
    expect(Object.keys(graph.obj()).length).toBeGreaterThan(300);
    expect(graph.obj()).toHaveProperty(['server/index.ts']);
    expect(graph.circular()).toEqual([]);
  }, 180_000);
});
