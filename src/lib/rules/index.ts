// Coneline's rules core: event schemas, checks, derived state, trade tables and calculators.
// Pure TypeScript with zod as its only dependency; the same import runs in the browser and on
// the server. Browser code imports core.ts instead, which is all of this except the zod
// helper below. Events are read by parseEvent alone (plain code): there is no zod event schema.
export * from './core';
export { formatZodError } from './errors';
