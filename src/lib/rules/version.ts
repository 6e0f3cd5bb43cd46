// The version of the rules: bump RULES_VERSION whenever a change to the checks, the derived
// state or their messages would judge a stored canal differently. The server stores on each
// canal the version that judged it, and re-judges unlocked canals in the background when
// this number changes.

/** Bumped by hand with every change to what the rules make of the same events. */
export const RULES_VERSION = 2;
