import type { APIRoute } from 'astro';
import { CONTRACT_VERSION, type MeAnswer } from '../../../lib/contract';
import { config } from '../../../lib/server/config';
import { db } from '../../../lib/server/db';
import { demoMode } from '../../../lib/server/demo-mode';
import { chairsideFacts } from '../../../lib/server/me';
import { json, jsonError } from '../../../lib/server/http';

export const GET: APIRoute = async ({ locals }) => {
  const user = locals.user;
  if (!user) return jsonError(401, 'Sign in first.');
  // `demo` and `clinic`: the chairside island is a static page and learns from here whether to
  // show the banner and in which zone and locale to show times.
  const me: MeAnswer = {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    demo: await demoMode(),
    clinic: config().clinic,
    contractVersion: CONTRACT_VERSION,
    // The student's attendings and the cone-fit setting, kept by the tablet for offline use.
    ...(await chairsideFacts(await db(), user)),
  };
  return json(me);
};
