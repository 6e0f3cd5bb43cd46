/** The built server on a fresh copy of the demo database made by the global setup. */
import { startServer as start, type TestServer } from '../../scripts/lib/server-process';
import { TEMPLATE_DB } from './paths';

export type { TestServer };
export { freePort } from '../../scripts/lib/server-process';

/** `outDir`: another build folder (e.g. a copy of dist/ a test changes). */
export function startServer(
  opts: { env?: Record<string, string>; emptyDb?: boolean; outDir?: string } = {},
): Promise<TestServer> {
  return start({ env: opts.env, outDir: opts.outDir, templateDb: opts.emptyDb ? undefined : TEMPLATE_DB });
}
