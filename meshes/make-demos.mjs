// Writes the demo meshes into this folder from the compiled generators (npm run demo-meshes).
// The output is fully determined by the code: a test checks the shipped files against it.
import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { DEMOS, DEMO_MAX_BYTES, demoBytes } from '../dist/demo/files.js';

const here = dirname(fileURLToPath(import.meta.url));
let failed = false;
for (const { file, make } of DEMOS) {
  const mesh = make();
  const bytes = demoBytes(mesh);
  if (bytes.length > DEMO_MAX_BYTES) {
    console.error(`${file}: ${bytes.length} bytes, over the ${DEMO_MAX_BYTES}-byte limit; not written`);
    failed = true;
    continue;
  }
  writeFileSync(join(here, file), bytes);
  console.log(`${file}: ${mesh.nPoints} points, ${mesh.nCells} cells, ${bytes.length} bytes`);
}
if (failed) process.exitCode = 1;
