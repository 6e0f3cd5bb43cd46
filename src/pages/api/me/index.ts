import type { APIRoute } from 'astro';
import { json, jsonError } from '../../../lib/server/http';

export const GET: APIRoute = ({ locals }) => {
  const user = locals.user;
  if (!user) return jsonError(401, 'Sign in first.');
  return json({ id: user.id, email: user.email, name: user.name, role: user.role });
};
