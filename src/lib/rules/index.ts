// Coneline's rules core: event schemas, checks, derived state, trade tables and calculators.
// Pure TypeScript with zod as its only dependency; the same import runs in the browser and on
// the server. Browser code imports core.ts instead, which is all of this except the two zod
// parts below.
export * from './core';
export { eventSchema } from './schema';
export { formatZodError } from './errors';
