// Throwaway (not committed): hash of the generated code of the demo and fixture models.
import { createHash } from 'node:crypto';
import { loadModel } from '../src/model/load/index.js';
import { compileModel } from '../src/model/compile/index.js';
const files = process.argv.slice(2);
for (const f of files) {
  const m = loadModel(f);
  const c = compileModel(m);
  const slots = m.parameters.map((_, i) => i);
  const s = c.sensitivity(slots);
  const free = c.sensitivity(m.parameters.flatMap((p, i) => (p.kind === 'free' ? [i] : [])));
  const h = createHash('sha256').update(JSON.stringify([c.source, s.source, free.source])).digest('hex').slice(0, 16);
  console.log(h, f);
}
