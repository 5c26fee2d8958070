// Writes docs/scenario.schema.json from the one declaration of the format (src/model/schema.ts).
// `npm run schema`; tests/model/schema.test.ts checks that the committed file is up to date.
import { writeFileSync, renameSync } from 'node:fs';
import { join } from 'node:path';
import { scenarioJsonSchemaText } from '../src/model/schema.js';

const target = join(import.meta.dirname, '..', 'docs', 'scenario.schema.json');
const tmp = `${target}.${process.pid}.tmp`;
writeFileSync(tmp, scenarioJsonSchemaText());
renameSync(tmp, target);
console.log(`wrote ${target}`);
