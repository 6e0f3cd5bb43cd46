// Writes docs/rules.md from the rules catalogue: `npx tsx scripts/gen-rules-doc.ts`.
// tests/lib/rules/reference-doc.test.ts fails when the file is out of date.
import { writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { renderRulesDoc } from '../src/lib/rules/reference-doc';

const target = fileURLToPath(new URL('../docs/rules.md', import.meta.url));
writeFileSync(target, renderRulesDoc());
console.log(`wrote ${target}`);
